import { canonicalJson } from "./canonical";
import { sha256Hex } from "../trace/hash";

/** The hash a chain starts from. */
export const GENESIS_HASH = "0".repeat(64);

export interface AuditFields {
  seq: number;
  at: Date;
  action: string;
  entity: string;
  entityId: string;
  actor: string;
  details: unknown;
  prevHash: string;
}

export interface AuditEntryRecord extends AuditFields {
  hash: string;
}

/** SHA-256 of the canonical JSON of every field but the hash itself. */
export function auditHash(e: AuditFields): string {
  return sha256Hex(
    canonicalJson({ seq: e.seq, at: e.at.toISOString(), action: e.action, entity: e.entity, entityId: e.entityId, actor: e.actor, details: e.details, prevHash: e.prevHash }),
  );
}

export interface ChainCheck {
  entries: number;
  ok: boolean;
  problems: string[];
}

/**
 * Re-checks a hash chain given in stored order (by seq): positions must run 1, 2, 3, … without a gap,
 * each entry must hash to its stored hash (content unchanged), and each must carry the previous
 * entry's hash (nothing removed, inserted or reordered). Removing the newest entries cannot be seen
 * from the chain alone; compare the count and last hash with an external copy for that.
 */
export function verifyAuditChain(entries: readonly AuditEntryRecord[]): ChainCheck {
  const problems: string[] = [];
  let prev = GENESIS_HASH;
  entries.forEach((e, i) => {
    const expectedSeq = i + 1;
    if (e.seq !== expectedSeq) problems.push(`entry at position ${expectedSeq} has number ${e.seq}: entries are missing or out of order`);
    if (auditHash(e) !== e.hash) problems.push(`entry ${e.seq} (${e.action} ${e.entity} ${e.entityId}): its content no longer matches its hash`);
    if (e.prevHash !== prev) problems.push(`entry ${e.seq}: does not follow the entry before it (chain broken)`);
    prev = e.hash;
  });
  return { entries: entries.length, ok: problems.length === 0, problems };
}
