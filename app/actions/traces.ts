"use server";

import { redirect } from "next/navigation";
import { z } from "zod";
import { importCsv, importOptionsSchema, TraceImportError } from "@/lib/trace";
import { createTrace } from "@/lib/db/traces";
import { fieldErrors, formValues, type FormState } from "@/lib/validation";

const uploadSchema = z.object({
  name: z.string().trim().max(160).optional(),
  file: z
    .instanceof(File, { message: "choose a logger file" })
    .refine((f) => f.size > 0, { message: "the chosen file is empty" })
    .refine((f) => f.size <= 50 * 1024 * 1024, { message: "files larger than 50 MB are not accepted" }),
});

/** Stores an uploaded logger file: original bytes, SHA-256, resolved import settings and the parsed series. */
export async function uploadTrace(_prev: FormState, form: FormData): Promise<FormState> {
  const values = formValues(form);
  const opt = (k: string) => {
    const v = form.get(k);
    return typeof v === "string" && v.trim() !== "" ? v.trim() : undefined;
  };
  const upload = uploadSchema.safeParse({ name: opt("name"), file: form.get("file") });
  if (!upload.success) return { fieldErrors: fieldErrors(upload.error), values };
  const options = importOptionsSchema.safeParse({
    timeColumn: opt("timeColumn"),
    airColumn: opt("airColumn"),
    unit: opt("unit"),
    timeZone: opt("timeZone"),
  });
  if (!options.success) return { fieldErrors: fieldErrors(options.error), values };

  const file = upload.data.file;
  const bytes = new Uint8Array(await file.arrayBuffer());
  let id: string;
  try {
    const imported = importCsv(bytes, options.data);
    id = await createTrace({ name: upload.data.name || file.name, fileName: file.name, bytes, imported });
  } catch (e) {
    if (e instanceof TraceImportError) return { message: `${file.name}: ${e.message}. Nothing was stored.`, values };
    throw e;
  }
  redirect(`/traces/${id}`);
}
