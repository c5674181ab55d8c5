import type { Prisma } from "../../generated/prisma/client";
import { db } from "./client";
import { auditHash, GENESIS_HASH, type AuditEntryRecord } from "../review/audit";

export type Tx = Prisma.TransactionClient;

export interface AuditEvent {
  action: "create" | "edit" | "import" | "run" | "sign" | "export" | "rename" | "verify";
  entity: "trace" | "definition" | "review";
  entityId: string;
  /** who did it: the reviewer's name at sign-off, "web" or "cli" otherwise (there are no accounts yet) */
  actor: string;
  details: Record<string, unknown>;
}

/**
 * Appends one entry to the hash chain, inside the caller's transaction so the entry and the change
 * it records are written together or not at all. SQLite serialises write transactions, so the
 * entry read as "last" stays the last until this one is added.
 */
export async function appendAudit(tx: Tx, e: AuditEvent, at: Date = new Date()): Promise<AuditEntryRecord> {
  const last = await tx.auditEntry.findFirst({ orderBy: { seq: "desc" }, select: { seq: true, hash: true } });
  const fields = {
    seq: (last?.seq ?? 0) + 1,
    at,
    action: e.action,
    entity: e.entity,
    entityId: e.entityId,
    actor: e.actor,
    details: JSON.parse(JSON.stringify(e.details)) as unknown,
    prevHash: last?.hash ?? GENESIS_HASH,
  };
  const hash = auditHash(fields);
  await tx.auditEntry.create({ data: { ...fields, details: fields.details as object, hash } });
  return { ...fields, hash };
}

/** Every entry in chain order. */
export async function listAudit(filter?: { entityId?: string }): Promise<AuditEntryRecord[]> {
  const rows = await db.auditEntry.findMany({ where: filter?.entityId ? { entityId: filter.entityId } : undefined, orderBy: { seq: "asc" } });
  return rows.map((r) => ({ ...r, details: r.details as unknown }));
}

/** Records an export (outside any other change). */
export async function logExport(reviewId: string, format: string, sha256: string): Promise<void> {
  await db.$transaction((tx) => appendAudit(tx, { action: "export", entity: "review", entityId: reviewId, actor: "web", details: { format, sha256 } }));
}

/** Records a download of a trace's original bytes, with the SHA-256 of the bytes served. */
export async function logOriginalDownload(traceId: string, sha256: string): Promise<void> {
  await db.$transaction((tx) => appendAudit(tx, { action: "export", entity: "trace", entityId: traceId, actor: "web", details: { format: "original", sha256 } }));
}

/** Records the result of re-checking a stored review (re-import and re-run, as `corelag verify --review` does). */
export async function logRecheck(reviewId: string, actor: string, details: { reproduced: boolean; problems: string[]; engineVersion: string; resultSha256: string }): Promise<AuditEntryRecord> {
  return db.$transaction((tx) => appendAudit(tx, { action: "verify", entity: "review", entityId: reviewId, actor, details }));
}
