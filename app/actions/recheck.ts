"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { recheckReview } from "@/lib/services/recheck";
import { guardAction } from "@/app/guard";

export interface RecheckState {
  result?: { reproduced: boolean; problems: string[]; seq: number; at: string };
  message?: string;
}

const recheckSchema = z.object({ reviewId: z.string().min(1, { message: "no review given" }).max(100) });

/** "Re-check this review": re-import and re-run from the stored inputs; the result goes to the audit log. */
export const recheckReviewAction = guardAction("read", async (actor, _prev: RecheckState, form: FormData): Promise<RecheckState> => {
  const parsed = recheckSchema.safeParse({ reviewId: form.get("reviewId") });
  if (!parsed.success) return { message: parsed.error.issues[0]!.message };
  const out = await recheckReview(parsed.data.reviewId, actor);
  if (!out.ok) return { message: out.message };
  revalidatePath("/audit");
  return { result: { reproduced: out.check.reproduced, problems: out.check.problems, seq: out.seq, at: out.at.toISOString() } };
});
