"use server";

import { redirect } from "next/navigation";
import { z } from "zod";
import { saveEffectivePack } from "@/lib/services/calibration";
import { formValues, textField, type FormState } from "@/lib/validation";
import { guardAction } from "@/app/guard";

const schema = z.object({
  name: z.string().trim().min(1, { message: "give the effective pack a name" }).max(120),
  traceId: z.string().min(1),
  productId: z.string().min(1, { message: "choose the product" }),
  packId: z.string().optional(),
  fitInitial: z.boolean(),
  fitOffset: z.boolean(),
});

export const saveEffectivePackAction = guardAction("definition:edit", async (actor, _prev: FormState, form: FormData): Promise<FormState> => {
  const values = formValues(form);
  const parsed = schema.safeParse({
    name: textField(form, "name") ?? "",
    traceId: textField(form, "traceId") ?? "",
    productId: textField(form, "productId") ?? "",
    packId: textField(form, "packId") || undefined,
    fitInitial: textField(form, "fitInitial") === "1",
    fitOffset: textField(form, "fitOffset") === "1",
  });
  if (!parsed.success) return { fieldErrors: Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])), values };
  const res = await saveEffectivePack(parsed.data, actor);
  if (!res.ok) return { message: res.message, values };
  redirect(`/packs?saved=1&edit=${res.packId}`);
});
