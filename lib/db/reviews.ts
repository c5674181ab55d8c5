import { randomUUID } from "node:crypto";
import { db } from "./client";
import { resolvePage, searchText, type PageRequest, type Paged } from "./page";
import { idsContaining } from "./textSearch";
import { appendAudit, type Tx } from "./audit";
import { bytesToFloat64, float64ToBytes } from "./bytes";
import type { ReviewComputation, ReviewResult } from "../review";
import type { Outcome } from "../exposure/rules";
import { reviewContentHash } from "../review/content";
import type { Actor } from "../access/actor";

/** What a sign-off means, recorded with it when the signer gives no other wording. */
export const DEFAULT_SIGN_MEANING = "I reviewed this record; the decision above is mine";

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
  correctsId?: string;
  actor: Actor;
  /** the review's id when the caller must know it in advance (a queued run stores under its job's id, so a retry cannot store twice) */
  id?: string;
}

/** Stores a review and its audit entry in one transaction. */
export async function createReview(r: NewReview): Promise<string> {
  return db.$transaction((tx) => insertReview(tx, r));
}

/** A review and its audit entry inside the caller's transaction (a shipment stores all its reviews at once). */
export async function insertReview(tx: Tx, r: NewReview): Promise<string> {
  const c = r.computation;
  // Inserted as exact JSON text: Prisma 6.19's Json write rounds some doubles (see insertDefinition), and
  // the stored result must hash, with the core series, to resultSha256. (A second database casts the JSON.)
  const id = r.id ?? randomUUID().replace(/-/g, "");
  const bytes = (a: Float64Array | undefined | null) => (a ? float64ToBytes(a) : null);
  await tx.$executeRaw`INSERT INTO "Review" ("id", "title", "traceId", "productId", "packId", "limitsId", "options", "engineVersion", "result", "coreC", "surfaceC", "meanC", "coolantC", "resultSha256", "outcome", "status", "correctsId", "createdAt")
    VALUES (${id}, ${r.title}, ${r.traceId}, ${r.productId}, ${r.packId ?? null}, ${r.limitsId}, ${JSON.stringify(r.options)}, ${r.engineVersion}, ${JSON.stringify(c.result)},
            ${bytes(c.core_C)}, ${bytes(c.surface_C)}, ${bytes(c.mean_C)}, ${bytes(c.coolant_C)}, ${r.resultSha256}, ${c.result.outcome}, ${"open"}, ${r.correctsId ?? null}, ${new Date()})`;
  const row = await tx.review.findUniqueOrThrow({ where: { id }, include: { trace: { select: { sha256: true } } } });
  const { trace: _trace, ...stored } = row;
  await appendAudit(tx, {
    action: "run",
    entity: "review",
    entityId: row.id,
    actor: r.actor,
    details: {
      traceId: r.traceId,
      traceSha256: row.trace.sha256,
      productId: r.productId,
      packId: r.packId ?? null,
      limitsId: r.limitsId,
      options: r.options,
      engineVersion: r.engineVersion,
      resultSha256: r.resultSha256,
      outcome: c.result.outcome,
      corrects: r.correctsId ?? null,
    },
    contentSha256: reviewContentHash(stored),
  });
  return row.id;
}

export type ReviewChange = { ok: true } | { ok: false; reason: "not-found" | "signed" | "comment-required"; message: string };

/** Shortest comment accepted as a reason for a decision that differs from the stored outcome. */
export const MIN_DIFFERING_COMMENT_CHARS = 5;
export const COMMENT_REQUIRED_MESSAGE = "a decision that differs from the suggested outcome needs a comment saying why";

/**
 * Sign-off: the reviewer's decision, final. A decision that differs from the STORED suggested outcome
 * needs a comment; this is checked here, inside the transaction, against the row itself, so no form
 * field (a hidden "suggested" value, say) can waive it.
 */
export async function signReview(id: string, s: { reviewer: string; decision: Outcome; comment?: string; meaning?: string }, actor: Actor): Promise<ReviewChange> {
  return db.$transaction(async (tx) => {
    const row = await tx.review.findUnique({ where: { id }, select: { status: true, outcome: true } });
    if (!row) return { ok: false, reason: "not-found", message: "that review does not exist" };
    if (row.status === "signed") return { ok: false, reason: "signed", message: "this review is already signed off; a correction is a new review" };
    if (s.decision !== row.outcome && (s.comment ?? "").trim().length < MIN_DIFFERING_COMMENT_CHARS) {
      return { ok: false, reason: "comment-required", message: COMMENT_REQUIRED_MESSAGE };
    }
    const signedAt = new Date();
    const meaning = s.meaning ?? DEFAULT_SIGN_MEANING;
    const signed = await tx.review.update({ where: { id }, data: { status: "signed", signedBy: s.reviewer, signedAt, decision: s.decision, signComment: s.comment ?? null, signMeaning: meaning } });
    await appendAudit(
      tx,
      {
        action: "sign",
        entity: "review",
        entityId: id,
        actor,
        details: { decision: s.decision, suggested: row.outcome, comment: s.comment ?? null, meaning, signedAt: signedAt.toISOString() },
        contentSha256: reviewContentHash(signed),
      },
      signedAt,
    );
    return { ok: true };
  });
}

/** Renames an open review; a signed one refuses. */
export async function renameReview(id: string, title: string, actor: Actor): Promise<ReviewChange> {
  return db.$transaction(async (tx) => {
    const row = await tx.review.findUnique({ where: { id }, select: { status: true, title: true } });
    if (!row) return { ok: false, reason: "not-found", message: "that review does not exist" };
    if (row.status === "signed") return { ok: false, reason: "signed", message: "a signed review cannot be edited; start a correction instead" };
    const renamed = await tx.review.update({ where: { id }, data: { title } });
    await appendAudit(tx, { action: "rename", entity: "review", entityId: id, actor, details: { from: row.title, to: title }, contentSha256: reviewContentHash(renamed) });
    return { ok: true };
  });
}

export async function getReview(id: string) {
  const row = await db.review.findUnique({
    where: { id },
    include: {
      trace: { select: { id: true, name: true, fileName: true, sha256: true, sampleCount: true, startAt: true, endAt: true, warnings: true, importSettings: true } },
      product: true,
      pack: true,
      limits: true,
      corrects: { select: { id: true, title: true } },
      correctedBy: { select: { id: true, title: true, createdAt: true } },
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
export type StoredReview = NonNullable<Awaited<ReturnType<typeof getReview>>>;

/**
 * The definitions of the newest review of one trace (or of any trace), with each definition's lineage, so
 * that a new review can start from the combination last used; null when there is none.
 */
export async function latestReviewInputs(traceId?: string): Promise<{ id: string; title: string; traceId: string; product: { id: string; lineage: string }; pack: { id: string; lineage: string } | null; limits: { id: string; lineage: string }; model: string | null } | null> {
  const row = await db.review.findFirst({
    where: traceId ? { traceId } : {},
    orderBy: [{ createdAt: "desc" }, { id: "desc" }],
    select: { id: true, title: true, traceId: true, options: true, product: { select: { id: true, lineage: true } }, pack: { select: { id: true, lineage: true } }, limits: { select: { id: true, lineage: true } } },
  });
  if (!row) return null;
  const model = (row.options as { model?: unknown } | null)?.model;
  return { id: row.id, title: row.title, traceId: row.traceId, product: row.product, pack: row.pack, limits: row.limits, model: typeof model === "string" ? model : null };
}

export interface ReviewFilter {
  outcome?: Outcome;
  status?: "open" | "signed";
  productLineage?: string;
  from?: Date;
  to?: Date;
}

const reviewListSelect = {
  id: true, title: true, outcome: true, status: true, decision: true, signedBy: true, createdAt: true, correctsId: true,
  trace: { select: { name: true } },
  product: { select: { name: true, version: true, lineage: true } },
} as const;

async function reviewWhere(filter: ReviewFilter & { q?: string }) {
  const t = searchText(filter.q);
  const [reviewIds, traceIds, productIds] = t ? await Promise.all([idsContaining("Review", t), idsContaining("Trace", t, ["name"]), idsContaining("Definition", t)]) : [[], [], []];
  return {
    outcome: filter.outcome,
    status: filter.status,
    product: filter.productLineage ? { lineage: filter.productLineage } : undefined,
    createdAt: filter.from || filter.to ? { gte: filter.from, lt: filter.to } : undefined,
    // text search (literal) over the title, the reviewer, the trace's and the product's names, and the exact id
    ...(t ? { OR: [{ id: { in: reviewIds } }, { traceId: { in: traceIds } }, { productId: { in: productIds } }, { id: t }] } : {}),
  };
}

export async function listReviews(filter: ReviewFilter = {}) {
  return db.review.findMany({ where: await reviewWhere(filter), select: reviewListSelect, orderBy: { createdAt: "desc" } });
}

/** One page of reviews, newest first, filtered and searched. */
export async function searchReviews(filter: ReviewFilter & { q?: string } & PageRequest = {}): Promise<Paged<Awaited<ReturnType<typeof listReviews>>[number]>> {
  const where = await reviewWhere(filter);
  const total = await db.review.count({ where });
  const p = resolvePage(filter, total);
  const rows = await db.review.findMany({ where, select: reviewListSelect, orderBy: [{ createdAt: "desc" }, { id: "asc" }], skip: p.skip, take: p.pageSize });
  return { rows, total, page: p.page, pageSize: p.pageSize, pages: p.pages };
}

/**
 * What the home page asks a reviewer to look at, counted in the database (no whole-table load): open
 * reviews suggesting hold or reject (the first few), open reviews suggesting accept, and signed
 * reviews whose decision differs from the suggestion.
 */
export async function reviewAttention(take = 5) {
  const openAttentionWhere = { status: "open", outcome: { not: "accept" } };
  const [openAttention, openAttentionCount, openAcceptCount, overriddenCount] = await Promise.all([
    db.review.findMany({ where: openAttentionWhere, select: { id: true, title: true }, orderBy: { createdAt: "desc" }, take }),
    db.review.count({ where: openAttentionWhere }),
    db.review.count({ where: { status: "open", outcome: "accept" } }),
    // at most 3 × 3 groups, whatever the number of reviews
    db.review.groupBy({ by: ["outcome", "decision"], where: { status: "signed" }, _count: { _all: true } }),
  ]).then(([a, b, c, groups]) => [a, b, c, groups.filter((g) => g.decision !== g.outcome).reduce((n, g) => n + g._count._all, 0)] as const);
  return { openAttention, openAttentionCount, openAcceptCount, overriddenCount };
}

/** Whether a review with this id is stored (a retried queued run checks before computing again). */
export async function reviewExists(id: string): Promise<boolean> {
  return (await db.review.count({ where: { id } })) > 0;
}

/** Ids of every stored review, oldest first (for verification). */
export async function allReviewIds(): Promise<string[]> {
  return (await db.review.findMany({ select: { id: true }, orderBy: { createdAt: "asc" } })).map((r) => r.id);
}
