import { db } from "./client";
import { bytesToFloat64, float64ToBytes } from "./bytes";
import type { ReviewComputation, ReviewResult } from "../review";

export interface NewReview {
  title: string;
  traceId: string;
  productId: string;
  packId?: string;
  limitsId: string;
  options: Record<string, unknown>;
  engineVersion: string;
  computation: ReviewComputation;
  resultSha256: string;
}

export async function createReview(r: NewReview): Promise<string> {
  const c = r.computation;
  const row = await db.review.create({
    data: {
      title: r.title,
      traceId: r.traceId,
      productId: r.productId,
      packId: r.packId ?? null,
      limitsId: r.limitsId,
      options: r.options as object,
      engineVersion: r.engineVersion,
      result: c.result as object,
      coreC: float64ToBytes(c.core_C),
      surfaceC: float64ToBytes(c.surface_C),
      meanC: float64ToBytes(c.mean_C),
      coolantC: c.coolant_C ? float64ToBytes(c.coolant_C) : null,
      resultSha256: r.resultSha256,
      outcome: c.result.outcome,
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
      pack: true,
      limits: true,
    },
  });
  if (!row) return null;
  const f = (b: Uint8Array | null) => (b ? bytesToFloat64(b) : null);
  return {
    ...row,
    result: row.result as unknown as ReviewResult,
    core_C: bytesToFloat64(row.coreC),
    surface_C: f(row.surfaceC),
    mean_C: f(row.meanC),
    coolant_C: f(row.coolantC),
  };
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
