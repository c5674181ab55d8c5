// External anchors: the chain's head written down outside the database (`corelag anchor`), so that
// removing the newest entries, or re-signing the chain with another key, shows up later.
import { z } from "zod";
import type { AuditEntryRecord } from "./audit";
import type { ChainHead, Finding, KeyPeriod } from "./records";

const hex64 = z.string().regex(/^[0-9a-f]{64}$/, { message: "must be 64 lowercase hex digits" });

export const anchorSchema = z.object({
  seq: z.number().int().min(1),
  hash: hex64,
  at: z.iso.datetime({ offset: true }),
  key_fingerprint: hex64,
  /** hash of entry 1: which chain (which database) this anchor belongs to */
  chain: hex64,
  anchored_at: z.iso.datetime({ offset: true }).optional(),
});
export type Anchor = z.infer<typeof anchorSchema>;

/** The anchor of a head; null when the chain is empty or its head is unsigned (nothing to vouch for it). */
export function anchorOf(head: ChainHead | null, now: Date): Anchor | null {
  if (!head || !head.key_fingerprint) return null;
  return { seq: head.seq, hash: head.hash, at: head.at, key_fingerprint: head.key_fingerprint, chain: head.chain, anchored_at: now.toISOString() };
}

/** The key in force when entry `seq` was written (the key entry itself is signed by the outgoing key). */
export function keyInForce(keys: readonly KeyPeriod[], seq: number): string | null {
  let fp: string | null = null;
  for (const k of keys) {
    if (k.fromSeq < seq || (k.fromSeq === seq && fp === null)) fp = k.fingerprint;
  }
  return fp;
}

/** Does this chain still contain the anchored head, signed by the anchored key? */
export function checkAnchor(entries: readonly AuditEntryRecord[], keys: readonly KeyPeriod[], anchor: Anchor): Finding[] {
  const first = entries[0];
  if (!first || first.hash !== anchor.chain) {
    return [
      {
        kind: "anchor-foreign",
        table: "AuditEntry",
        entry: anchor.seq,
        message: first
          ? `this anchor belongs to another database: its chain begins with entry hash ${anchor.chain.slice(0, 16)}…, this database's with ${first.hash.slice(0, 16)}… (or this chain was rewritten from its first entry)`
          : `this anchor belongs to another database: this database's chain is empty`,
      },
    ];
  }
  const e = entries.find((x) => x.seq === anchor.seq);
  if (!e) {
    const last = entries.at(-1)!.seq;
    return [{ kind: "anchor-missing", table: "AuditEntry", entry: anchor.seq, message: `the anchor records entry ${anchor.seq} (${anchor.hash.slice(0, 16)}…, ${anchor.at}), but the chain ends at entry ${last}: entries were removed` }];
  }
  const out: Finding[] = [];
  if (e.hash !== anchor.hash) {
    out.push({ kind: "anchor-rewritten", table: "AuditEntry", entry: anchor.seq, message: `entry ${anchor.seq} no longer has the anchored hash ${anchor.hash.slice(0, 16)}… (now ${e.hash.slice(0, 16)}…): the chain was rewritten` });
  }
  const fp = keyInForce(keys, anchor.seq);
  if (fp !== anchor.key_fingerprint) {
    out.push({
      kind: "anchor-key",
      table: "AuditEntry",
      entry: anchor.seq,
      message: `the anchor was signed by key ${anchor.key_fingerprint.slice(0, 16)}…, but this chain's entry ${anchor.seq} by ${fp ? `key ${fp.slice(0, 16)}…` : "no key"}: the chain was re-signed with another key`,
    });
  }
  return out;
}
