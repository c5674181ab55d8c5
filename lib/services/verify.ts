// Verifying the stored records: the audit chain, then each review re-imported and re-run.
import { listAudit } from "../db/audit";
import { allReviewIds } from "../db/reviews";
import { verifyAuditChain } from "../review/audit";
import { verifyStoredReview } from "./reviews";

export interface DatabaseVerification {
  ok: boolean;
  chain: ReturnType<typeof verifyAuditChain>;
  reviews: Awaited<ReturnType<typeof verifyStoredReview>>[];
}

/** Checks the chain and re-runs one review (reviewId) or every stored review. */
export async function verifyDatabase(reviewId?: string): Promise<DatabaseVerification> {
  const chain = verifyAuditChain(await listAudit());
  const ids = reviewId ? [reviewId] : await allReviewIds();
  const reviews = [];
  for (const id of ids) reviews.push(await verifyStoredReview(id));
  return { ok: chain.ok && reviews.every((r) => r.reproduced), chain, reviews };
}
