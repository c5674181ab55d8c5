"use client";

import { useActionState } from "react";
import { signOutAction } from "@/app/actions/session";
import { ActionForm } from "./ActionForm";
import type { FormState } from "@/lib/validation";

export function SignOutButton() {
  const [, action, pending] = useActionState<FormState, FormData>(signOutAction, {});
  return (
    <ActionForm action={action} className="inline">
      <button type="submit" className="link" disabled={pending}>Sign out</button>
    </ActionForm>
  );
}
