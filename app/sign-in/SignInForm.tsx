"use client";

import { useActionState } from "react";
import { signInAction } from "@/app/actions/session";
import { ActionForm } from "@/app/components/ActionForm";
import { Field } from "@/app/components/Field";
import type { FormState } from "@/lib/validation";

export function SignInForm({ next }: { next?: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(signInAction, {});
  return (
    <ActionForm action={action} className="stack" aria-label="Sign in">
      <input type="hidden" name="next" value={next ?? ""} />
      <Field name="email" label="E-mail" type="email" autoComplete="username" state={state} required />
      <Field name="password" label="Password" type="password" autoComplete="current-password" state={{ ...state, values: {} }} required />
      {state.message && (
        <p className={state.values?.locked ? "form-error locked" : "form-error"} data-testid="sign-in-error" role="status">
          {state.message}
        </p>
      )}
      <button type="submit" disabled={pending}>{pending ? "Signing in…" : "Sign in"}</button>
    </ActionForm>
  );
}
