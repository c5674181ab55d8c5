// The pure part of `corelag verify`: given everything read from storage, compare the rows with the
// audit chain, the chain with itself and its signatures, and list every discrepancy as a finding.
// Storage-specific checks (integrity, foreign keys) are added by the reader (lib/db/recordSnapshot.ts).
import type { KeyObject } from "node:crypto";
import { auditHash, GENESIS_HASH, type AuditEntryRecord } from "./audit";
import { canonicalJson } from "./canonical";
import { sha256Hex } from "../trace/hash";
import {
  definitionContentHash,
  reviewContentHash,
  shipmentRowContentHash,
  SHIPMENT_TABLES,
  traceContentHash,
  type DefinitionRowContent,
  type ShipmentTable,
  type ReviewRowContent,
  type TraceRowContent,
} from "./content";
import { keyFingerprint, publicKeyFromText, verifyEntrySignature } from "./signature";

export type FindingKind =
  // storage
  | "storage-damaged"
  | "foreign-key-hole"
  | "table-unreadable"
  // the chain itself
  | "chain-broken"
  | "entry-altered"
  | "chain-unsigned"
  | "entry-unsigned"
  | "signature-invalid"
  | "key-unendorsed"
  | "key-foreign"
  // rows against the chain
  | "row-altered"
  | "row-missing"
  | "row-unaudited"
  | "row-unsealed"
  | "stored-hash-mismatch"
  | "row-inconsistent"
  | "review-not-reproduced"
  // external anchors
  | "anchor-foreign"
  | "anchor-missing"
  | "anchor-rewritten"
  | "anchor-key";

export interface Finding {
  kind: FindingKind;
  message: string;
  /** the table concerned ("Trace", "Definition", "Review", "AuditEntry", …) */
  table?: string;
  /** the row's id */
  row?: string;
  /** the audit entry concerned (its seq) */
  entry?: number;
}

export interface SignatureRecord {
  seq: number;
  keyFingerprint: string;
  signature: string;
}

export interface RecordSnapshot {
  entries: AuditEntryRecord[];
  signatures: SignatureRecord[];
  traces: TraceRowContent[];
  definitions: DefinitionRowContent[];
  reviews: ReviewRowContent[];
  /** rows of the shipment tables (issue 15), each with its table; JSON columns parsed */
  shipmentRows?: Array<{ table: ShipmentTable; row: Record<string, unknown> & { id: string } }>;
  /** tables the reader could not read to the end (damage): rows missing from them are not reported one by one */
  incompleteTables: string[];
  /** when set, only these rows were read (a scoped check, e.g. one review and its inputs) */
  scope?: ReadonlySet<string>;
  /**
   * when set, `entries` holds the chain from `fromSeq` on, plus entry 1, every key entry and the scoped
   * rows' entries (a light check from a verified entry); otherwise the whole chain
   */
  partial?: { fromSeq: number };
}

export interface KeyPeriod {
  fingerprint: string;
  /** the "key" entry that introduced it */
  fromSeq: number;
}

export interface ChainHead {
  seq: number;
  hash: string;
  at: string;
  /** the key that signed the head entry (null when the chain is not signed) */
  key_fingerprint: string | null;
  /** the hash of entry 1: names the chain, so an anchor from another database is recognised */
  chain: string;
}

export interface RecordCheck {
  findings: Finding[];
  head: ChainHead | null;
  keys: KeyPeriod[];
}

/** Actions that create or change a row, and so carry its content hash (exports and re-checks change nothing). */
export const CONTENT_ACTIONS: ReadonlySet<string> = new Set(["create", "edit", "import", "run", "sign", "rename", "seal"]);

const ENTITY_TABLE: Record<string, string> = {
  trace: "Trace", definition: "Definition", review: "Review",
  ...Object.fromEntries(Object.entries(SHIPMENT_TABLES).map(([table, spec]) => [spec.entity, table])),
};

/** Sequence, content and linkage of the entries (what `verifyAuditChain` checks), as findings. */
export function chainFindings(entries: readonly AuditEntryRecord[], from?: { seq: number; hash: string }): Finding[] {
  const out: Finding[] = [];
  let prev = from?.hash ?? GENESIS_HASH;
  const before = from?.seq ?? 0;
  entries.forEach((e, i) => {
    const what = `entry ${e.seq} (${e.action} ${e.entity} ${e.entityId})`;
    if (e.seq !== before + i + 1) out.push({ kind: "chain-broken", table: "AuditEntry", entry: e.seq, message: `entry at position ${before + i + 1} has number ${e.seq}: entries are missing or out of order` });
    if (auditHash(e) !== e.hash) out.push({ kind: "entry-altered", table: "AuditEntry", entry: e.seq, message: `${what}: its content no longer matches its hash` });
    if (e.prevHash !== prev) out.push({ kind: "chain-broken", table: "AuditEntry", entry: e.seq, message: `${what}: does not follow the entry before it (chain broken)` });
    prev = e.hash;
  });
  return out;
}

/**
 * The signatures. Entries before the first "key" entry (written before signing existed) are covered by
 * the first signed entry, whose hash chains them. From then on every entry must be signed by the key
 * in force: the first key signs its own entry; a rotation entry is signed by the outgoing key (which
 * endorses the new one), and later entries by the new key.
 */
export function signatureFindings(
  entries: readonly AuditEntryRecord[],
  signatures: readonly SignatureRecord[],
  /** signatures already found valid, as `seq|hash|fingerprint|signature` (a memo of a pure check: any change misses it) */
  validMemo?: Set<string>,
  /** for a check of the chain's tail: the key in force before its first entry */
  inForce?: { fingerprint: string; fromSeq: number; key: KeyObject },
): { findings: Finding[]; keys: KeyPeriod[]; signerOf: Map<number, string> } {
  const out: Finding[] = [];
  const keys: KeyPeriod[] = inForce ? [{ fingerprint: inForce.fingerprint, fromSeq: inForce.fromSeq }] : [];
  const signerOf = new Map<number, string>();
  const sigs = new Map(signatures.map((s) => [s.seq, s]));
  type InForce = { fp: string; key: KeyObject };
  let current: InForce | null = inForce ? { fp: inForce.fingerprint, key: inForce.key } : null;
  for (const e of entries) {
    const sig = sigs.get(e.seq);
    let signer: InForce | null = current;
    let next: InForce | null = null;
    if (e.action === "key") {
      const d = (e.details ?? {}) as { publicKey?: unknown; fingerprint?: unknown; previous?: unknown };
      const k = typeof d.publicKey === "string" ? publicKeyFromText(d.publicKey) : null;
      if (!k) {
        out.push({ kind: "signature-invalid", table: "AuditEntry", entry: e.seq, message: `entry ${e.seq} records a signing key that is not a valid Ed25519 public key` });
      } else {
        const fp = keyFingerprint(k);
        if (fp !== d.fingerprint || fp !== e.entityId) out.push({ kind: "signature-invalid", table: "AuditEntry", entry: e.seq, message: `entry ${e.seq}: the recorded key fingerprint does not match the recorded public key` });
        next = { fp, key: k };
        if (current && d.previous !== current.fp) {
          out.push({ kind: "key-unendorsed", table: "AuditEntry", entry: e.seq, message: `entry ${e.seq} introduces key ${fp.slice(0, 16)}… but does not name the key in force (${current.fp.slice(0, 16)}…) as its predecessor` });
        }
        if (!current) signer = next;
      }
    }
    if (signer) {
      if (!sig) out.push({ kind: "entry-unsigned", table: "AuditEntry", entry: e.seq, message: `entry ${e.seq} (${e.action} ${e.entity} ${e.entityId}) has no signature, but key ${signer.fp.slice(0, 16)}… was in force` });
      else if (sig.keyFingerprint !== signer.fp) out.push({ kind: "signature-invalid", table: "AuditEntry", entry: e.seq, message: `entry ${e.seq} is signed by key ${sig.keyFingerprint.slice(0, 16)}…, but the key in force was ${signer.fp.slice(0, 16)}…` });
      else {
        const memoKey = `${e.seq}|${e.hash}|${signer.fp}|${sig.signature}`;
        if (validMemo?.has(memoKey) || verifyEntrySignature(signer.key, e.seq, e.hash, sig.signature)) {
          validMemo?.add(memoKey);
          signerOf.set(e.seq, signer.fp);
        } else {
          out.push({ kind: "signature-invalid", table: "AuditEntry", entry: e.seq, message: `entry ${e.seq} (${e.action} ${e.entity} ${e.entityId}): its signature does not match its hash (re-hashed or altered without the key)` });
        }
      }
    } else if (sig) {
      out.push({ kind: "signature-invalid", table: "AuditEntry", entry: e.seq, message: `entry ${e.seq} carries a signature although no key had been recorded before it` });
    }
    if (next) {
      keys.push({ fingerprint: next.fp, fromSeq: e.seq });
      current = next;
    }
  }
  if (entries.length > 0 && keys.length === 0) out.push({ kind: "chain-unsigned", table: "AuditEntry", message: "no signing key is recorded in the chain: nothing outside the database vouches for it" });
  const last = entries.at(-1)?.seq ?? 0;
  for (const s of signatures) {
    if (s.seq > last) out.push({ kind: "chain-broken", table: "AuditSignature", entry: s.seq, message: `a signature exists for entry ${s.seq}, but the chain ends at entry ${last}: newer entries were removed` });
  }
  return { findings: out, keys, signerOf };
}

type ContentRow = { entity: string; id: string; hash: string; table: string };

/** Rows against the chain: each row's current content hash must equal the one its latest entry recorded, and each entry must have its row. */
export function rowFindings(s: RecordSnapshot): Finding[] {
  const out: Finding[] = [];
  const rows: ContentRow[] = [
    ...s.traces.map((r) => ({ entity: "trace", id: r.id, hash: traceContentHash(r), table: "Trace" })),
    ...s.definitions.map((r) => ({ entity: "definition", id: r.id, hash: definitionContentHash(r), table: "Definition" })),
    ...s.reviews.map((r) => ({ entity: "review", id: r.id, hash: reviewContentHash(r), table: "Review" })),
    ...(s.shipmentRows ?? []).map((r) => ({ entity: SHIPMENT_TABLES[r.table].entity, id: r.row.id, hash: shipmentRowContentHash(r.table, r.row), table: r.table })),
  ];
  const key = (entity: string, id: string) => `${entity}:${id}`;
  const present = new Set(rows.map((r) => key(r.entity, r.id)));
  const firstEntry = new Map<string, number>();
  const latestContent = new Map<string, { seq: number; contentSha256: string | null }>();
  const shipmentEntities = new Set(Object.values(SHIPMENT_TABLES).map((t) => t.entity as string));
  for (const e of s.entries) {
    if (!ENTITY_TABLE[e.entity]) continue;
    // a reader that did not read the shipment tables cannot say their rows are missing
    if (s.shipmentRows === undefined && shipmentEntities.has(e.entity)) continue;
    const k = key(e.entity, e.entityId);
    if (!firstEntry.has(k)) firstEntry.set(k, e.seq);
    if (!CONTENT_ACTIONS.has(e.action)) continue; // an export or a re-check changes nothing
    const c = (e.details as { contentSha256?: unknown } | null)?.contentSha256;
    latestContent.set(k, { seq: e.seq, contentSha256: typeof c === "string" ? c : null });
  }
  for (const [k, seq] of firstEntry) {
    const [entity, id] = [k.slice(0, k.indexOf(":")), k.slice(k.indexOf(":") + 1)];
    const table = ENTITY_TABLE[entity]!;
    if (present.has(k) || (s.scope && !s.scope.has(id)) || s.incompleteTables.includes(table)) continue;
    out.push({ kind: "row-missing", table, row: id, entry: seq, message: `${entity} ${id} is recorded by entry ${seq}, but its row is gone` });
  }
  for (const r of rows) {
    const latest = latestContent.get(key(r.entity, r.id));
    if (!latest) {
      out.push({ kind: "row-unaudited", table: r.table, row: r.id, message: `${r.entity} ${r.id} has no audit entry: it was written outside the application` });
    } else if (latest.contentSha256 === null) {
      out.push({ kind: "row-unsealed", table: r.table, row: r.id, entry: latest.seq, message: `${r.entity} ${r.id}: its latest entry (${latest.seq}) predates content hashes; run \`corelag seal\` once after upgrading` });
    } else if (latest.contentSha256 !== r.hash) {
      out.push({ kind: "row-altered", table: r.table, row: r.id, entry: latest.seq, message: `${r.entity} ${r.id} no longer matches the content recorded by entry ${latest.seq}: it was changed outside the application` });
    }
  }
  for (const t of s.traces) {
    if (t.original && sha256Hex(t.original) !== t.sha256) out.push({ kind: "stored-hash-mismatch", table: "Trace", row: t.id, message: `trace ${t.id}: the original bytes no longer match the stored SHA-256` });
  }
  for (const d of s.definitions) {
    if (sha256Hex(canonicalJson(d.body)) !== d.sha256) out.push({ kind: "stored-hash-mismatch", table: "Definition", row: d.id, message: `definition ${d.id} (${d.name} v${d.version}): its body no longer matches its stored SHA-256` });
  }
  for (const r of s.reviews) {
    // resultSha256 is not recomputed from the stored JSON: the JSON column does not keep every double's last
    // digit, so only a re-run (review-not-reproduced) can check it; the content hash covers the stored text.
    const resultOutcome = (r.result as { outcome?: unknown } | null)?.outcome;
    if (resultOutcome !== r.outcome) out.push({ kind: "row-inconsistent", table: "Review", row: r.id, message: `review ${r.id}: the outcome column says '${r.outcome}' but the stored result says '${String(resultOutcome)}'` });
  }
  return out;
}

export function chainHead(entries: readonly AuditEntryRecord[], signerOf: ReadonlyMap<number, string>): ChainHead | null {
  const last = entries.at(-1);
  if (!last) return null;
  return { seq: last.seq, hash: last.hash, at: last.at.toISOString(), key_fingerprint: signerOf.get(last.seq) ?? null, chain: entries[0]!.hash };
}

/** The chain's key in force is not this installation's key. */
function foreignKey(keys: readonly KeyPeriod[], local: string | null | undefined): Finding[] {
  const current = keys.at(-1);
  if (!local || !current || current.fingerprint === local) return [];
  return [
    {
      kind: "key-foreign",
      table: "AuditEntry",
      entry: current.fromSeq,
      message: `the chain is signed by key ${current.fingerprint.slice(0, 16)}…, but this installation's key is ${local.slice(0, 16)}…: the chain was re-signed elsewhere, or the key file was replaced`,
    },
  ];
}

/** Every check that needs no engine run and no storage access. */
export function checkRecords(s: RecordSnapshot, opts: { localKeyFingerprint?: string | null; validSignatures?: Set<string> } = {}): RecordCheck {
  const sig = signatureFindings(s.entries, s.signatures, opts.validSignatures);
  const findings = [...chainFindings(s.entries), ...sig.findings, ...rowFindings(s)];
  findings.push(...foreignKey(sig.keys, opts.localKeyFingerprint));
  return { findings, head: chainHead(s.entries, sig.signerOf), keys: sig.keys };
}

/** An entry already verified with the whole chain before it: where a light check starts. */
export interface VerifiedHead {
  seq: number;
  hash: string;
}

/**
 * The light check of a page view: the chain after a verified head (each entry's hash, link and signature),
 * the entries that give the tail its meaning (entry 1, every key entry, the rows' own entries: hash and
 * signature), the verified head still in place with its hash, and the rows in scope against their latest
 * entries. A change to an older entry made without re-hashing it, or to a trace's original bytes behind an
 * unchanged SHA-256 column, is left to the full check (`checkRecords`: the re-check and `corelag verify`).
 * A rewrite of the chain up to the head cannot pass: the head's hash would differ.
 */
export function checkRecordsFrom(s: RecordSnapshot, from: VerifiedHead | null, opts: { localKeyFingerprint?: string | null; validSignatures?: Set<string> } = {}): RecordCheck {
  if (!from) return checkRecords(s, opts);
  const findings: Finding[] = [];
  const at = s.entries.find((e) => e.seq === from.seq);
  if (!at || at.hash !== from.hash) {
    findings.push({
      kind: "chain-broken",
      table: "AuditEntry",
      entry: from.seq,
      message: at
        ? `entry ${from.seq} no longer has the hash it had when the chain was last verified (${from.hash.slice(0, 16)}…, now ${at.hash.slice(0, 16)}…): the chain was rewritten`
        : `entry ${from.seq}, verified earlier, is gone: entries were removed`,
    });
  }
  const tail = s.entries.filter((e) => e.seq > from.seq);
  findings.push(...chainFindings(tail, from));
  for (const e of s.entries) {
    if (e.seq <= from.seq && auditHash(e) !== e.hash) {
      findings.push({ kind: "entry-altered", table: "AuditEntry", entry: e.seq, message: `entry ${e.seq} (${e.action} ${e.entity} ${e.entityId}): its content no longer matches its hash` });
    }
  }
  // every key entry is read, so the key in force is known at each entry checked
  const sig = signatureFindings(s.entries, s.signatures, opts.validSignatures);
  findings.push(...sig.findings, ...rowFindings(s));
  findings.push(...foreignKey(sig.keys, opts.localKeyFingerprint));
  return { findings, head: chainHead(s.entries, sig.signerOf), keys: sig.keys };
}
