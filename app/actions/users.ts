"use server";

import { revalidatePath } from "next/cache";
import { guardAction } from "@/app/guard";
import { addUser, changeDisabled, changeRole, resetPassword } from "@/lib/services/users";
import { formValues, textField, type FormState } from "@/lib/validation";

export const addUserAction = guardAction("user:admin", async (actor, _prev: FormState, form: FormData): Promise<FormState> => {
  const { password: _p, ...values } = formValues(form);
  const res = await addUser({ email: textField(form, "email") ?? "", name: textField(form, "name") ?? "", role: textField(form, "role") ?? "", password: textField(form, "password") ?? "" }, actor);
  if (!res.ok && res.reason === "invalid") return { fieldErrors: { [res.field]: res.message }, values };
  if (!res.ok) return { message: res.message, values };
  revalidatePath("/users");
  return { message: `Added ${res.user.email} (${res.user.role}). Give them the password by a separate channel.` , values: {} };
});

export const setRoleAction = guardAction("user:admin", async (actor, _prev: FormState, form: FormData): Promise<FormState> => {
  const res = await changeRole(textField(form, "userId") ?? "", textField(form, "role") ?? "", actor);
  if (!res.ok) return { message: res.message };
  revalidatePath("/users");
  return { message: `${res.user.email} now has the ${res.user.role} role.` };
});

export const setDisabledAction = guardAction("user:admin", async (actor, _prev: FormState, form: FormData): Promise<FormState> => {
  const disabled = textField(form, "disabled") === "1";
  const res = await changeDisabled(textField(form, "userId") ?? "", disabled, actor);
  if (!res.ok) return { message: res.message };
  revalidatePath("/users");
  return { message: `${res.user.email} is ${disabled ? "disabled; their sessions have ended" : "enabled again"}.` };
});

/** An administrator sets a new password for a user (a forgotten one): their sessions end and a lockout lifts. */
export const resetPasswordAction = guardAction("user:admin", async (actor, _prev: FormState, form: FormData): Promise<FormState> => {
  const res = await resetPassword(textField(form, "userId") ?? "", textField(form, "password") ?? "", actor);
  if (!res.ok && res.reason === "invalid") return { fieldErrors: { password: res.message } };
  if (!res.ok) return { message: res.message };
  revalidatePath("/users");
  return { message: `New password set for ${res.user.email}; their sessions have ended. Give it to them by a separate channel.` };
});
