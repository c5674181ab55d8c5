import { getReview } from "../db/reviews";
import { logRecheck } from "../db/audit";
import { ENGINE_VERSION } from "../review/runReview";
import { verifyStoredReview, type ReproductionCheck } from "./reviews";
import { verifyReviewRecord } from "./verify";
import type { Actor } from "../access/actor";

export type RecheckOutcome = { ok: true; check: ReproductionCheck; seq: number; at: Date } | { ok: false; message: string };

/**
 * "Re-check this review", as `corelag verify --review ID` does: the review and its inputs are checked
 * against the signed audit chain (content hashes, signatures), the stored original bytes are re-imported
 * with the recorded settings and the engine re-run on the recorded definition versions. The result is
 * recorded in the audit log whether it reproduced or not.
 */
export async function recheckReview(reviewId: string, actor: Actor): Promise<RecheckOutcome> {
  const review = await getReview(reviewId);
  if (!review) return { ok: false, message: "that review does not exist" };
  const records = await verifyReviewRecord({ reviewId, traceId: review.traceId, productId: review.productId, packId: review.packId, limitsId: review.limitsId }, { full: true });
  const run = await verifyStoredReview(reviewId);
  const problems = [...records.findings.map((f) => f.message), ...run.problems];
  const check: ReproductionCheck = { ...run, reproduced: problems.length === 0, problems };
  const entry = await logRecheck(reviewId, actor, { reproduced: check.reproduced, problems, engineVersion: ENGINE_VERSION, resultSha256: review.resultSha256 });
  return { ok: true, check, seq: entry.seq, at: entry.at };
}
