"use server";

import { redirect } from "next/navigation";
import { runAndStoreReview, runReviewRequestSchema } from "@/lib/services/reviews";
import { fieldErrors, formValues, textField, type FormState } from "@/lib/validation";

export async function startReview(_prev: FormState, form: FormData): Promise<FormState> {
  const values = formValues(form);
  const parsed = runReviewRequestSchema.safeParse({
    title: textField(form, "title") ?? "",
    traceId: textField(form, "traceId") ?? "",
    productId: textField(form, "productId") ?? "",
    limitsId: textField(form, "limitsId") ?? "",
    packId: textField(form, "packId") || undefined,
    model: textField(form, "model") || undefined,
  });
  if (!parsed.success) return { fieldErrors: fieldErrors(parsed.error), values };
  const outcome = await runAndStoreReview(parsed.data);
  if (!outcome.ok) return { fieldErrors: { [outcome.field]: outcome.message }, values };
  redirect(`/reviews/${outcome.reviewId}`);
}
