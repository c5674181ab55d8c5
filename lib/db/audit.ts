import type { Prisma } from "../../generated/prisma/client";
import { db, dbKind } from "./client";
import { auditHash, GENESIS_HASH, type AuditEntryRecord } from "../review/audit";
import { publicKeyText, signEntry } from "../review/signature";
import { definitionContentHash, reviewContentHash, traceContentHash } from "../review/content";
import { CONTENT_ACTIONS, type SignatureRecord } from "../review/records";
import { loadSigningKey, prepareKeyRotation, SigningKeyError, type SigningKey } from "./signingKey";
import { actorLabel, actorRecord, type Actor } from "../access/actor";

export type Tx = Prisma.TransactionClient;

export interface AuditEvent {
  action:
    | "create" | "edit" | "import" | "run" | "sign" | "export" | "rename" | "verify" | "key" | "seal" | "cancel" | "readings" | "raise" | "clear" | "deliver" | "close"
    // accounts (issue 13): a sign-in, a refused one, a sign-out; a user's role changed, disabled or enabled
    | "sign-in" | "sign-in-refused" | "sign-out" | "set-role" | "disable" | "enable" | "set-password"
    // a signature refused for its password (wrong, or the account locked); counts toward the sign-in lockout
    | "signature-refused"
    // an alert delivery's retry taken up after the process that scheduled it stopped (entity "delivery": the attempt's row)
    | "resume"
    // API tokens (issue 13): a token revoked
    | "revoke";
  /** "run": a background run that stored nothing (cancelled); its entityId is the run's id. "chain": a full check of the chain (entityId: the head checked). "user": an account (its id, or the e-mail typed when it names no user) */
  entity: "trace" | "definition" | "review" | "key" | "run" | "monitor" | "alert" | "delivery" | "shipment" | "lane" | "logger" | "shipmentLogger" | "shipmentReview" | "chain" | "user" | "token";
  entityId: string;
  /** who did it: written as `actorLabel` in the entry's actor column and as `actorRecord` in its details */
  actor: Actor;
  details: Record<string, unknown>;
  /** SHA-256 of the canonical content of the row as this change left it (lib/review/content.ts); every change but an export has one */
  contentSha256?: string;
}

/** The advisory-lock key that serialises audit appends on PostgreSQL (any fixed number; "corl" in ASCII). */
const AUDIT_CHAIN_LOCK = 0x636f726c;

/**
 * Makes this transaction the only one appending to the chain until it commits or rolls back. PostgreSQL:
 * a transaction-scoped advisory lock, taken before the chain's head is read (READ COMMITTED: the next
 * statement sees the entry the previous holder committed), so concurrent writers on any number of app
 * instances queue instead of colliding on the next sequence number. SQLite: the transaction already holds
 * the database's one write lock (BEGIN IMMEDIATE, lib/db/guardTransactions.ts). Exported for a check-then-append
 * that must be atomic across instances (claimDeliveryRetry).
 */
export async function lockChain(tx: Tx): Promise<void> {
  if (dbKind() === "postgres") await tx.$executeRawUnsafe(`SELECT pg_advisory_xact_lock(${AUDIT_CHAIN_LOCK})`);
}

/** Writes one entry and its signature; the caller has checked that `signer` is the key in force. */
async function writeEntry(tx: Tx, e: AuditEvent, signer: SigningKey, at: Date): Promise<AuditEntryRecord> {
  const last = await tx.auditEntry.findFirst({ orderBy: { seq: "desc" }, select: { seq: true, hash: true } });
  const details = { ...e.details, actor: actorRecord(e.actor), ...(e.contentSha256 ? { contentSha256: e.contentSha256 } : {}) };
  const fields = {
    seq: (last?.seq ?? 0) + 1,
    at,
    action: e.action,
    entity: e.entity,
    entityId: e.entityId,
    actor: actorLabel(e.actor),
    details: JSON.parse(JSON.stringify(details)) as unknown,
    prevHash: last?.hash ?? GENESIS_HASH,
  };
  const hash = auditHash(fields);
  await tx.auditEntry.create({ data: { ...fields, details: fields.details as object, hash } });
  await tx.auditSignature.create({ data: { seq: fields.seq, keyFingerprint: signer.fingerprint, signature: signEntry(signer.privateKey, fields.seq, hash) } });
  return { ...fields, hash };
}

/** The actor of entries the application makes on its own (the first key entry, the demo loader). */
export const SYSTEM_ACTOR: Actor = { kind: "system", what: "corelag" };

const keyEvent = (k: SigningKey, previous: string | null, actor: Actor): AuditEvent => ({
  action: "key",
  entity: "key",
  entityId: k.fingerprint,
  actor,
  details: { fingerprint: k.fingerprint, publicKey: publicKeyText(k.privateKey), previous },
});

/** The fingerprint of the key the chain says is in force (null before the first key entry). */
async function chainKey(tx: Tx): Promise<string | null> {
  return (await tx.auditEntry.findFirst({ where: { action: "key" }, orderBy: { seq: "desc" }, select: { entityId: true } }))?.entityId ?? null;
}

/**
 * Appends one entry to the hash chain, signed, inside the caller's transaction so the entry and the
 * change it records are written together or not at all. Appends are serialised (lockChain), so the
 * entry read as "last" stays the last until this one is added. The first write records the signing
 * key in the chain; a key that is not the chain's key is refused (rotate with `corelag key rotate`).
 */
export async function appendAudit(tx: Tx, e: AuditEvent, at: Date = new Date()): Promise<AuditEntryRecord> {
  const signer = loadSigningKey({ create: true })!;
  await lockChain(tx);
  const inForce = await chainKey(tx);
  if (inForce === null) await writeEntry(tx, keyEvent(signer, null, SYSTEM_ACTOR), signer, at);
  else if (inForce !== signer.fingerprint) {
    throw new SigningKeyError(
      `the signing key ${signer.fingerprint.slice(0, 16)}… (${signer.source}) is not the key this audit chain is signed with (${inForce.slice(0, 16)}…): restore that key, or rotate keys with \`corelag key rotate\``,
    );
  }
  return writeEntry(tx, e, signer, at);
}

/** A new signing key, recorded in the chain and endorsed by the outgoing key; the old private key is deleted. */
export async function rotateSigningKey(actor: Actor): Promise<{ from: string; to: string; seq: number }> {
  const r = prepareKeyRotation();
  try {
    const entry = await db.$transaction(async (tx) => {
      await lockChain(tx);
      const inForce = await chainKey(tx);
      if (inForce !== null && inForce !== r.old.fingerprint) throw new SigningKeyError(`the current key file is not the chain's key (${inForce.slice(0, 16)}…); rotation needs the key in force`);
      if (inForce === null) await writeEntry(tx, keyEvent(r.old, null, SYSTEM_ACTOR), r.old, new Date());
      return writeEntry(tx, keyEvent(r.next, r.old.fingerprint, actor), r.old, new Date());
    });
    r.commit();
    return { from: r.old.fingerprint, to: r.next.fingerprint, seq: entry.seq };
  } catch (e) {
    r.abandon();
    throw e;
  }
}

/** Every entry in chain order. */
export async function listAudit(filter?: { entityId?: string }): Promise<AuditEntryRecord[]> {
  const rows = await db.auditEntry.findMany({ where: filter?.entityId ? { entityId: filter.entityId } : undefined, orderBy: { seq: "asc" } });
  return rows.map((r) => ({ ...r, details: r.details as unknown }));
}

export async function listSignatures(): Promise<SignatureRecord[]> {
  return db.auditSignature.findMany({ orderBy: { seq: "asc" } });
}

/** Records an export (outside any other change). */
export async function logExport(reviewId: string, format: string, sha256: string, actor: Actor): Promise<void> {
  await db.$transaction((tx) => appendAudit(tx, { action: "export", entity: "review", entityId: reviewId, actor, details: { format, sha256 } }));
}

/** Records a download of a trace's original bytes, with the SHA-256 of the bytes served. */
export async function logOriginalDownload(traceId: string, sha256: string, actor: Actor): Promise<void> {
  await db.$transaction((tx) => appendAudit(tx, { action: "export", entity: "trace", entityId: traceId, actor, details: { format: "original", sha256 } }));
}

/** Records the result of re-checking a stored review (re-import and re-run, as `corelag verify --review` does). */
export async function logRecheck(reviewId: string, actor: Actor, details: { reproduced: boolean; problems: string[]; engineVersion: string; resultSha256: string }): Promise<AuditEntryRecord> {
  return db.$transaction((tx) => appendAudit(tx, { action: "verify", entity: "review", entityId: reviewId, actor, details }));
}

/** A full check of the chain (the audit page's button), recorded with its result: later views verify from its head. */
export async function logChainCheck(actor: Actor, details: { ok: boolean; head_seq: number | null; head_hash: string | null; key_fingerprint: string | null; findings: number; problems: string[] }): Promise<AuditEntryRecord> {
  return db.$transaction((tx) => appendAudit(tx, { action: "verify", entity: "chain", entityId: details.head_seq === null ? "empty" : String(details.head_seq), actor, details }));
}

/** The newest full chain check recorded in the log, as stored; null when there is none. Its integrity is checked by the light check that starts from it (it lies after the head it verified). */
export async function lastChainCheckEntry(): Promise<AuditEntryRecord | null> {
  const e = await db.auditEntry.findFirst({ where: { action: "verify", entity: "chain" }, orderBy: { seq: "desc" } });
  return e ? { seq: e.seq, at: e.at, action: e.action, entity: e.entity, entityId: e.entityId, actor: e.actor, details: e.details, prevHash: e.prevHash, hash: e.hash } : null;
}

/**
 * Once after upgrading: rows whose latest entry was written before entries carried content hashes get a
 * "seal" entry with their current content hash. Rows with no entry at all are left for verify to report.
 */
export async function sealUnsealedRows(actor: Actor): Promise<number> {
  const entries = await db.auditEntry.findMany({ where: { entity: { in: ["trace", "definition", "review"] }, action: { in: [...CONTENT_ACTIONS] } }, orderBy: { seq: "asc" }, select: { entity: true, entityId: true, details: true } });
  const latest = new Map<string, boolean>();
  for (const e of entries) latest.set(`${e.entity}:${e.entityId}`, typeof (e.details as { contentSha256?: unknown } | null)?.contentSha256 === "string");
  const unsealed = [...latest].filter(([, sealed]) => !sealed).map(([k]) => k);
  for (const k of unsealed) {
    const [entity, id] = [k.slice(0, k.indexOf(":")), k.slice(k.indexOf(":") + 1)];
    await db.$transaction(async (tx) => {
      const hash =
        entity === "trace" ? await tx.trace.findUnique({ where: { id } }).then((r) => r && traceContentHash(r))
        : entity === "definition" ? await tx.definition.findUnique({ where: { id } }).then((r) => r && definitionContentHash(r))
        : await tx.review.findUnique({ where: { id } }).then((r) => r && reviewContentHash(r));
      if (hash) await appendAudit(tx, { action: "seal", entity: entity as AuditEvent["entity"], entityId: id, actor, details: { reason: "content hash recorded after upgrade" }, contentSha256: hash });
    });
  }
  return unsealed.length;
}
