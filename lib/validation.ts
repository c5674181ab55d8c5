import type { z } from "zod";

/** What a form action returns when it does not redirect. */
export interface FormState {
  message?: string;
  fieldErrors?: Record<string, string>;
  /** the user's input, echoed back so a refused form keeps what was typed */
  values?: Record<string, string>;
}

/** First message per field path ("properties.cp_J_kgK"), for showing beside each input. */
export function fieldErrors(error: z.ZodError): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.join(".") || "form";
    if (!(key in out)) out[key] = issue.message;
  }
  return out;
}

/** A form field as a number: blank becomes undefined (optional), anything else Number() (NaN is refused by zod). */
export function numberField(form: FormData, name: string): number | undefined {
  const v = form.get(name);
  if (v === null || (typeof v === "string" && v.trim() === "")) return undefined;
  return Number(String(v).trim());
}

export function textField(form: FormData, name: string): string | undefined {
  const v = form.get(name);
  return typeof v === "string" ? v : undefined;
}

export function formValues(form: FormData): Record<string, string> {
  const out: Record<string, string> = {};
  form.forEach((v, k) => {
    if (typeof v === "string" && !k.startsWith("$")) out[k] = v;
  });
  return out;
}
