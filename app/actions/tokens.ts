"use server";

import { revalidatePath } from "next/cache";
import { guardAction } from "@/app/guard";
import { createToken, revokeToken } from "@/lib/services/apiTokens";
import { formValues, numberField, textField, type FormState } from "@/lib/validation";

export type TokenFormState = FormState & { created?: { id: string; token: string; scope: string; expires_at: string | null; owner: string } };

/** An administrator makes a token for a user; the token is in this answer and shown once. */
export const createTokenAction = guardAction("user:admin", async (actor, _prev: TokenFormState, form: FormData): Promise<TokenFormState> => {
  const values = formValues(form);
  const days = textField(form, "expiresDays")?.trim();
  const r = await createToken(
    { email: textField(form, "email") ?? "", name: textField(form, "name") ?? "", scope: (textField(form, "scope") || "read") as "read", expiresDays: days ? numberField(form, "expiresDays") : undefined, monitorId: textField(form, "monitorId")?.trim() || undefined },
    actor,
  );
  if (!r.ok) return { fieldErrors: { [r.field]: r.message }, values };
  revalidatePath("/tokens");
  return { created: { id: r.created.id, token: r.created.token, scope: r.created.scope, expires_at: r.created.expires_at, owner: r.created.owner } };
});

export const revokeTokenAction = guardAction("user:admin", async (actor, _prev: FormState, form: FormData): Promise<FormState> => {
  const r = await revokeToken(textField(form, "id") ?? "", actor);
  if (!r.ok) return { message: r.message };
  revalidatePath("/tokens");
  return { message: `Revoked '${r.token.name}' (${r.token.prefix}…): it is refused from the next request on.` };
});
