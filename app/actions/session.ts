"use server";

import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { guardAction, publicAction } from "@/app/guard";
import { signIn, signInSchema, signOut } from "@/lib/services/access";
import { addFirstAdmin } from "@/lib/services/users";
import { fieldErrors, formValues, textField, type FormState } from "@/lib/validation";

/** Where to go after signing in: a path of this site only (never "//host" or a URL). */
function safeNext(v: string | undefined): string {
  return v && /^\/(?![/\\])[^\s]*$/.test(v) && !v.startsWith("/sign-in") ? v : "/";
}

/** The form's values to show again, without the password. */
function withoutPassword(form: FormData): Record<string, string> {
  const { password: _p, ...rest } = formValues(form);
  return rest;
}

export const signInAction = publicAction("signing in is what an anonymous caller does", async (_prev: FormState, form: FormData): Promise<FormState> => {
  const values = withoutPassword(form);
  const parsed = signInSchema.safeParse({ email: textField(form, "email") ?? "", password: textField(form, "password") ?? "" });
  if (!parsed.success) return { fieldErrors: fieldErrors(parsed.error), values };
  const res = await signIn(parsed.data, await headers());
  if (!res.ok) return { message: res.message, values: { ...values, ...(res.locked ? { locked: "1" } : {}) } };
  redirect(safeNext(textField(form, "next")));
});

export const createFirstAdminAction = publicAction("the one-time first administrator, refused once any user exists", async (_prev: FormState, form: FormData): Promise<FormState> => {
  const values = withoutPassword(form);
  const password = textField(form, "password") ?? "";
  if (password !== (textField(form, "confirm") ?? "")) return { fieldErrors: { confirm: "the two passwords differ" }, values };
  const res = await addFirstAdmin({ email: textField(form, "email") ?? "", name: textField(form, "name") ?? "", password }, { kind: "system", what: "first administrator" });
  if (!res.ok && res.reason === "invalid") return { fieldErrors: { [res.field]: res.message }, values };
  if (!res.ok) return { message: res.message, values };
  redirect("/sign-in?created=1");
});

export const signOutAction = guardAction("read", async (): Promise<FormState> => {
  await signOut(await headers());
  redirect("/sign-in?signed_out=1");
});
