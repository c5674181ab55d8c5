"use client";

import { useActionState } from "react";
import { saveLoggerAction } from "@/app/actions/shipments";
import { ActionForm } from "@/app/components/ActionForm";
import { Field, FormMessage } from "@/app/components/Field";
import type { FormState } from "@/lib/validation";

export function LoggerForm({ editing, serial }: { serial?: string; editing?: { id: string; serial: string; description: string; accuracyK: string; lastCalibrationAt: string; nextCalibrationAt: string } }) {
  const [state, action, pending] = useActionState<FormState, FormData>(saveLoggerAction, {});
  return (
    <ActionForm action={action} className="stack" aria-label="Logger">
      {editing && <input type="hidden" name="loggerId" value={editing.id} />}
      <div className="grid2">
        <Field name="serial" label="Serial" state={state} defaultValue={editing?.serial ?? serial} readOnly={!!editing} />
        <Field name="description" label="Description" state={state} defaultValue={editing?.description} />
        <Field name="accuracyK" label="Stated accuracy, K" hint="± as the maker states it (e.g. 0.5)" type="number" step="0.01" state={state} defaultValue={editing?.accuracyK} />
        <Field name="lastCalibrationAt" label="Last calibration (UTC)" type="datetime-local" state={state} defaultValue={editing?.lastCalibrationAt} />
        <Field name="nextCalibrationAt" label="Next calibration due (UTC)" type="datetime-local" state={state} defaultValue={editing?.nextCalibrationAt} />
      </div>
      <FormMessage state={state} />
      <button type="submit" disabled={pending}>{editing ? "Save" : "Register"}</button>
    </ActionForm>
  );
}
