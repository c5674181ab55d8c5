"use client";

import { useActionState } from "react";
import { createFirstAdminAction } from "@/app/actions/session";
import { ActionForm } from "@/app/components/ActionForm";
import { Field, FormMessage } from "@/app/components/Field";
import type { FormState } from "@/lib/validation";

export function SetupForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(createFirstAdminAction, {});
  const noPasswords = { ...state, values: Object.fromEntries(Object.entries(state.values ?? {}).filter(([k]) => k !== "confirm")) };
  return (
    <ActionForm action={action} className="stack" aria-label="Create the administrator">
      <Field name="name" label="Your name" hint="As it should appear in the audit log and on signatures" autoComplete="name" state={state} required />
      <Field name="email" label="E-mail" type="email" autoComplete="username" state={state} required />
      <Field name="password" label="Password" hint="At least 12 characters" type="password" autoComplete="new-password" state={noPasswords} required />
      <Field name="confirm" label="Password again" type="password" autoComplete="new-password" state={noPasswords} required />
      <FormMessage state={state} />
      <button type="submit" disabled={pending}>{pending ? "Creating…" : "Create the administrator"}</button>
    </ActionForm>
  );
}
