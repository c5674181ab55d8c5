"use client";

import { useActionState } from "react";
import { uploadTrace } from "@/app/actions/traces";
import { Field, FormMessage } from "@/app/components/Field";
import type { FormState } from "@/lib/validation";

export function UploadForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(uploadTrace, {});
  const fileError = state.fieldErrors?.file;
  return (
    <form action={action} className="stack" aria-label="Upload a logger file">
      <label htmlFor="f-file">
        Logger file (CSV)
        <span className="hint">A timestamp column and an air-temperature column; metadata lines above the header are skipped.</span>
        <input id="f-file" name="file" type="file" accept=".csv,.txt,text/csv" required aria-invalid={fileError ? true : undefined} />
        {fileError && <span className="field-error" data-testid="error-file">{fileError}</span>}
      </label>
      <Field name="name" label="Name" hint="Defaults to the file name, e.g. 'Route 7, tote 3'" state={state} />
      <details>
        <summary>Import settings (detected when left blank)</summary>
        <div className="stack" style={{ display: "grid", gap: "0.8rem", marginTop: "0.6rem" }}>
          <Field name="timeColumn" label="Timestamp column" state={state} />
          <Field name="airColumn" label="Air temperature column" state={state} />
          <label htmlFor="f-unit">
            Temperature unit
            <select id="f-unit" name="unit" defaultValue={state.values?.unit ?? ""}>
              <option value="">from the header, else °C</option>
              <option value="C">°C</option>
              <option value="F">°F</option>
              <option value="K">K</option>
            </select>
          </label>
          <Field name="timeZone" label="Time zone for times without an offset" hint="IANA name, e.g. Europe/Madrid; default UTC" errorKey="timeZone" state={state} />
        </div>
      </details>
      <FormMessage state={state} />
      <button type="submit" disabled={pending}>{pending ? "Importing…" : "Upload and import"}</button>
    </form>
  );
}
