import { getReview } from "../db/reviews";
import { logRecheck } from "../db/audit";
import { ENGINE_VERSION } from "../review/runReview";
import { verifyStoredReview, type ReproductionCheck } from "./reviews";

export type RecheckOutcome = { ok: true; check: ReproductionCheck; seq: number; at: Date } | { ok: false; message: string };

/**
 * "Re-check this review": re-imports the stored original bytes with the recorded settings and re-runs
 * the engine on the recorded definition versions (what `corelag verify --review ID` does), then
 * records the result in the audit log, whether it reproduced or not.
 */
export async function recheckReview(reviewId: string, actor = "web"): Promise<RecheckOutcome> {
  const review = await getReview(reviewId);
  if (!review) return { ok: false, message: "that review does not exist" };
  const check = await verifyStoredReview(reviewId);
  const entry = await logRecheck(reviewId, actor, { reproduced: check.reproduced, problems: check.problems, engineVersion: ENGINE_VERSION, resultSha256: review.resultSha256 });
  return { ok: true, check, seq: entry.seq, at: entry.at };
}
