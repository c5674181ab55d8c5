"use server";

import { redirect } from "next/navigation";
import { limitSetSchema } from "@/lib/exposure/limits";
import { createDefinition } from "@/lib/db/definitions";
import { fieldErrors, formValues, type FormState } from "@/lib/validation";

/** The limit-set editor posts its rules as one JSON field; it is validated as a whole here. */
export async function createLimitSet(_prev: FormState, form: FormData): Promise<FormState> {
  const values = formValues(form);
  let body: unknown;
  try {
    body = JSON.parse(String(form.get("definition") ?? ""));
  } catch {
    return { message: "the limit set could not be read; reload the page and try again", values };
  }
  const parsed = limitSetSchema.safeParse(body);
  if (!parsed.success) return { fieldErrors: fieldErrors(parsed.error), values };
  await createDefinition("limits", parsed.data);
  redirect("/limits?saved=1");
}
