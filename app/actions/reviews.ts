"use server";

import { redirect } from "next/navigation";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { runReviewRequestSchema } from "@/lib/services/reviews";
import { signReviewWithPassword, signatureSchema } from "@/lib/services/signature";
import { startReviewRun, waitForRun } from "@/lib/services/runs";
import { renameReview } from "@/lib/db/reviews";
import { guardAction } from "@/app/guard";
import { fieldErrors, formValues, textField, type FormState } from "@/lib/validation";

/** channels besides the core that the form offers for the growth and shelf-life models (checkboxes cc-air, …) */
const CONSEQUENCE_CHANNELS = ["air", "surface", "mean", "probe"] as const;

/** datetime-local inputs carry no zone; the form states that they are UTC. */
const utc = (v: string | undefined) => (v ? (v.length === 16 ? `${v}:00Z` : `${v}Z`) : undefined);

export const startReview = guardAction("review:run", async (actor, _prev: FormState, form: FormData): Promise<FormState> => {
  const values = formValues(form);
  let uncertainty: unknown = undefined;
  const rawU = (textField(form, "uncertainty") ?? "").trim();
  if (rawU) {
    try {
      uncertainty = JSON.parse(rawU);
    } catch (e) {
      return { fieldErrors: { uncertainty: `not valid JSON (${(e as Error).message})` }, values };
    }
  }
  const parsed = runReviewRequestSchema.safeParse({
    uncertainty,
    title: textField(form, "title") ?? "",
    traceId: textField(form, "traceId") ?? "",
    productId: textField(form, "productId") ?? "",
    limitsId: textField(form, "limitsId") ?? "",
    packId: textField(form, "packId") || undefined,
    model: textField(form, "model") || undefined,
    windowStart: utc(textField(form, "windowStart") || undefined),
    windowEnd: utc(textField(form, "windowEnd") || undefined),
    correctsId: textField(form, "correctsId") || undefined,
    consequenceChannels: CONSEQUENCE_CHANNELS.filter((c) => textField(form, `cc-${c}`) === "on"),
  });
  if (!parsed.success) return { fieldErrors: fieldErrors(parsed.error), values };
  // The engine runs in the worker pool; a quick run opens its review directly, a long one its progress page.
  const started = await startReviewRun(parsed.data, actor);
  if (!started.ok) return started.field === "form" ? { message: started.message, values } : { fieldErrors: { [started.field]: started.message }, values };
  const run = await waitForRun(started.run.id, 2_000);
  if (run?.status === "failed") return { message: run.message, values };
  if (run?.status === "done" && run.reviewId) redirect(`/reviews/${run.reviewId}`);
  redirect(`/runs/${started.run.id}`);
});

export const signOffReview = guardAction("review:sign", async (actor, _prev: FormState, form: FormData): Promise<FormState> => {
  // never echo the password back into the form
  const { password: _p, ...values } = formValues(form);
  const id = textField(form, "reviewId") ?? "";
  const parsed = signatureSchema.safeParse({
    decision: textField(form, "decision") ?? "",
    comment: textField(form, "comment") || undefined,
    password: textField(form, "password") ?? "",
  });
  if (!parsed.success) return { fieldErrors: fieldErrors(parsed.error), values };
  // The service checks the password, the second-person rule, that the stored inputs still reproduce the
  // review, and the decision against the stored outcome; a form field cannot waive any of them.
  const res = await signReviewWithPassword(id, parsed.data, actor);
  if (!res.ok && res.field) return { fieldErrors: { [res.field]: res.message }, values };
  if (!res.ok) return { message: res.message, values };
  revalidatePath(`/reviews/${id}`);
  redirect(`/reviews/${id}`);
});

const renameSchema = z.object({ title: z.string().trim().min(1, { message: "give the review a title" }).max(160) });

export const renameReviewAction = guardAction("review:run", async (actor, _prev: FormState, form: FormData): Promise<FormState> => {
  const values = formValues(form);
  const id = textField(form, "reviewId") ?? "";
  const parsed = renameSchema.safeParse({ title: textField(form, "title") ?? "" });
  if (!parsed.success) return { fieldErrors: fieldErrors(parsed.error), values };
  const res = await renameReview(id, parsed.data.title, actor);
  if (!res.ok) return { message: res.message, values };
  redirect(`/reviews/${id}`);
});
