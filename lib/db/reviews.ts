import { db } from "./client";
import { bytesToFloat64, float64ToBytes } from "./bytes";
import type { ReviewResult } from "../review";

export interface NewReview {
  title: string;
  traceId: string;
  productId: string;
  packId?: string;
  limitsId: string;
  options: Record<string, unknown>;
  engineVersion: string;
  result: ReviewResult;
  core_C: Float64Array;
  resultSha256: string;
}

export async function createReview(r: NewReview): Promise<string> {
  const row = await db.review.create({
    data: {
      title: r.title,
      traceId: r.traceId,
      productId: r.productId,
      packId: r.packId ?? null,
      limitsId: r.limitsId,
      options: r.options as object,
      engineVersion: r.engineVersion,
      result: r.result as object,
      coreC: float64ToBytes(r.core_C),
      resultSha256: r.resultSha256,
      outcome: r.result.outcome,
    },
    select: { id: true },
  });
  return row.id;
}

export async function getReview(id: string) {
  const row = await db.review.findUnique({
    where: { id },
    include: {
      trace: { select: { id: true, name: true, fileName: true, sha256: true, sampleCount: true, startAt: true, endAt: true, warnings: true } },
      product: true,
      limits: true,
    },
  });
  if (!row) return null;
  return { ...row, result: row.result as unknown as ReviewResult, core_C: bytesToFloat64(row.coreC) };
}

export async function listReviews() {
  return db.review.findMany({
    select: {
      id: true, title: true, outcome: true, createdAt: true,
      trace: { select: { name: true } },
      product: { select: { name: true, version: true } },
    },
    orderBy: { createdAt: "desc" },
  });
}
