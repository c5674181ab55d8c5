// Cursor-paged reads for the HTTP API: a client that archives or mirrors records walks forward (audit,
// by sequence number) or backward (reviews, newest first) with `after`, so rows written meanwhile never
// shift a page the way page numbers would.
import { db } from "./client";
import type { AuditEntryRecord } from "../review/audit";

/** Audit entries with seq > after, oldest first; `more` when the chain goes on past this page. */
export async function auditAfter(after: number, limit: number): Promise<{ entries: AuditEntryRecord[]; more: boolean }> {
  const rows = await db.auditEntry.findMany({ where: { seq: { gt: after } }, orderBy: { seq: "asc" }, take: limit + 1 });
  const more = rows.length > limit;
  return { entries: rows.slice(0, limit).map((r) => ({ ...r, details: r.details as unknown })), more };
}

export interface ReviewSummaryRow {
  id: string;
  title: string;
  status: string;
  outcome: string;
  decision: string | null;
  createdAt: Date;
  traceId: string;
  productId: string;
  limitsId: string;
  resultSha256: string;
}

export type ReviewsAfter = { ok: true; rows: ReviewSummaryRow[]; more: boolean } | { ok: false; reason: "unknown-cursor" };

/**
 * Reviews newest first (creation time, then id), starting after the review `after` (the last one of
 * the previous page); a cursor naming no review is refused rather than silently restarting.
 */
export async function reviewsAfter(filter: { status?: string; outcome?: string }, after: string | undefined, limit: number): Promise<ReviewsAfter> {
  let cursor: { id: string; createdAt: Date } | null = null;
  if (after !== undefined) {
    cursor = await db.review.findUnique({ where: { id: after }, select: { id: true, createdAt: true } });
    if (!cursor) return { ok: false, reason: "unknown-cursor" };
  }
  const rows = await db.review.findMany({
    where: {
      status: filter.status,
      outcome: filter.outcome,
      ...(cursor ? { OR: [{ createdAt: { lt: cursor.createdAt } }, { createdAt: cursor.createdAt, id: { gt: cursor.id } }] } : {}),
    },
    select: { id: true, title: true, status: true, outcome: true, decision: true, createdAt: true, traceId: true, productId: true, limitsId: true, resultSha256: true },
    orderBy: [{ createdAt: "desc" }, { id: "asc" }],
    take: limit + 1,
  });
  return { ok: true, rows: rows.slice(0, limit), more: rows.length > limit };
}
