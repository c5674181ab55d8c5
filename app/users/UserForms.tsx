"use client";

import { useActionState, useState } from "react";
import { addUserAction, resetPasswordAction, setDisabledAction, setRoleAction } from "@/app/actions/users";
import { ActionForm } from "@/app/components/ActionForm";
import { Field, FormMessage } from "@/app/components/Field";
import { ROLES } from "@/lib/access/roles";
import type { FormState } from "@/lib/validation";

export function AddUserForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(addUserAction, {});
  const [role, setRole] = useState<string>(state.values?.role ?? "reviewer");
  return (
    <ActionForm action={action} className="stack" aria-label="Add a user">
      <Field name="name" label="Name" hint="As it will appear in the audit log and on signatures" state={state} required />
      <Field name="email" label="E-mail" type="email" state={state} required />
      <label htmlFor="f-role">
        Role
        <select id="f-role" name="role" value={role} onChange={(e) => setRole(e.target.value)} data-testid="new-user-role">
          {ROLES.map((r) => <option key={r} value={r}>{r}</option>)}
        </select>
        {state.fieldErrors?.role && <span className="field-error" data-testid="error-role">{state.fieldErrors.role}</span>}
      </label>
      <Field name="password" label="First password" hint="At least 12 characters; give it to the person by a separate channel" type="password" autoComplete="new-password" state={{ ...state, values: {} }} required />
      <FormMessage state={state} />
      <button type="submit" disabled={pending}>Add user</button>
    </ActionForm>
  );
}

export function RoleForm({ userId, role }: { userId: string; role: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(setRoleAction, {});
  const [value, setValue] = useState(role);
  return (
    <ActionForm action={action} className="inline" aria-label="Change role">
      <input type="hidden" name="userId" value={userId} />
      <select name="role" value={value} onChange={(e) => setValue(e.target.value)} aria-label="Role" data-testid={`role-${userId}`}>
        {ROLES.map((r) => <option key={r} value={r}>{r}</option>)}
      </select>
      <button type="submit" className="secondary" disabled={pending || value === role}>Change role</button>
      {state.message && <span className="hint" data-testid="role-message">{state.message}</span>}
    </ActionForm>
  );
}

export function DisableForm({ userId, disabled }: { userId: string; disabled: boolean }) {
  const [state, action, pending] = useActionState<FormState, FormData>(setDisabledAction, {});
  return (
    <ActionForm action={action} className="inline" aria-label={disabled ? "Enable" : "Disable"}>
      <input type="hidden" name="userId" value={userId} />
      <input type="hidden" name="disabled" value={disabled ? "0" : "1"} />
      <button type="submit" className="secondary" disabled={pending}>{disabled ? "Enable" : "Disable"}</button>
      {state.message && <span className="hint" data-testid="disable-message">{state.message}</span>}
    </ActionForm>
  );
}

/** A new password for a forgotten one: typed by the administrator, given to the person by a separate channel. */
export function PasswordForm({ userId, email }: { userId: string; email: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(resetPasswordAction, {});
  return (
    <details>
      <summary>Set a new password</summary>
      <ActionForm action={action} className="inline" aria-label={`New password for ${email}`}>
        <input type="hidden" name="userId" value={userId} />
        <input type="password" name="password" autoComplete="new-password" placeholder="at least 12 characters" aria-label={`New password for ${email}`} aria-invalid={state.fieldErrors?.password ? true : undefined} data-testid={`new-password-${email}`} />
        <button type="submit" className="secondary" disabled={pending}>Set password</button>
        {state.fieldErrors?.password && <span className="field-error" data-testid="password-error">{state.fieldErrors.password}</span>}
        {state.message && <span className="hint" data-testid="password-message">{state.message}</span>}
      </ActionForm>
    </details>
  );
}
