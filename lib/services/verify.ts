// `corelag verify` and the app's "verified at" line: storage checks, the chain and its signatures, every
// row against its latest audit entry, an optional external anchor, and (CLI) re-running stored reviews.
import { readRecordSnapshot } from "../db/recordSnapshot";
export { postgresDatabaseProblem } from "../db/presence";
export { backupDatabase, restoreDatabase, BackupError } from "../db/backup";
import { loadSigningKey, SigningKeyError } from "../db/signingKey";
import { lastRecordedAnchor, recordAnchor } from "../db/anchorLog";
import { lastChainCheckEntry, logChainCheck, rotateSigningKey, sealUnsealedRows, SYSTEM_ACTOR } from "../db/audit";
import { databaseUrl } from "../db/env";
import { checkRecords, checkRecordsFrom, type ChainHead, type Finding, type VerifiedHead } from "../review/records";
import { checkAnchor, anchorOf, type Anchor } from "../review/anchor";
import { verifyAuditChain, type ChainCheck } from "../review/audit";
import { verifyStoredReview, type ReproductionCheck } from "./reviews";
import type { Actor } from "../access/actor";

export interface KeyStatus {
  /** the key in force according to the chain */
  chain: string | null;
  /** this installation's key (key file or environment), when there is one */
  local: string | null;
  note?: string;
}

export interface VerifyReport {
  ok: boolean;
  checked_at: string;
  head: ChainHead | null;
  key: KeyStatus;
  findings: Finding[];
  /** the chain check alone (kept for scripts written against earlier versions) */
  chain: ChainCheck;
  reviews: ReproductionCheck[];
  anchor?: { given: Anchor; contained: boolean };
}

function localKey(): { fp: string | null; note?: string } {
  try {
    const k = loadSigningKey({ create: false });
    return k ? { fp: k.fingerprint } : { fp: null, note: "no signing key on this machine: compare the chain's key fingerprint with an anchor kept elsewhere (--anchor)" };
  } catch (e) {
    return { fp: null, note: `the local signing key cannot be used: ${(e as Error).message}` };
  }
}

// Signatures this process has already checked (Ed25519 verification costs about 0.1–0.3 ms each, and the app
// checks the whole chain on every review page). Keyed by everything the check depends on, so a changed entry
// or signature is checked again. Bounded: cleared when it grows past a million entries.
const validSignatures = new Set<string>();

/** Checks the records without re-running the engine; `scope` limits the rows read (the chain is always read whole). */
export async function checkStoredRecords(opts: { scope?: ReadonlySet<string>; anchor?: Anchor; storageChecks?: boolean; now?: Date } = {}) {
  const { snapshot, storage } = await readRecordSnapshot({ scope: opts.scope, storageChecks: opts.storageChecks });
  const local = localKey();
  if (validSignatures.size > 1_000_000) validSignatures.clear();
  const check = checkRecords(snapshot, { localKeyFingerprint: local.fp, validSignatures });
  const findings = [...storage, ...check.findings];
  let anchor: VerifyReport["anchor"];
  if (opts.anchor) {
    const af = checkAnchor(snapshot.entries, check.keys, opts.anchor);
    findings.push(...af);
    anchor = { given: opts.anchor, contained: af.length === 0 };
  }
  const key: KeyStatus = { chain: check.keys.at(-1)?.fingerprint ?? null, local: local.fp, ...(local.note ? { note: local.note } : {}) };
  return { snapshot, findings, head: check.head, key, anchor, checked_at: (opts.now ?? new Date()).toISOString() };
}

/** Where a light check starts and what vouches for it. */
export interface LightFrom {
  head: VerifiedHead;
  /** "log": a full check recorded in the audit log (its entry); "process": this server verified up to here */
  source: "log" | "process";
  checked_at: string;
  /** the log entry that recorded the full check */
  entry?: number;
  actor?: string;
}

// Heads this process found intact (per database): the next light check starts there. Trusted because the
// process verified them itself; a recorded full check (in the signed log) is the other starting point.
const verifiedHeads = new Map<string, LightFrom>();

/** The details a full chain check records in the log, and reads back as a starting point. */
export interface ChainCheckDetails {
  ok: boolean;
  head_seq: number | null;
  head_hash: string | null;
  key_fingerprint: string | null;
  findings: number;
  /** the first findings' messages, for the log */
  problems: string[];
}

/** The newest full chain check recorded in the log, with its result; null when none (or the database cannot be read). */
export async function lastChainCheck(): Promise<{ seq: number; at: string; actor: string; ok: boolean; head_seq: number | null; head_hash: string | null; findings: number } | null> {
  let e: Awaited<ReturnType<typeof lastChainCheckEntry>>;
  try {
    e = await lastChainCheckEntry();
  } catch {
    return null; // the light check that follows reports what is wrong with the database
  }
  if (!e) return null;
  const d = (e.details ?? {}) as Partial<ChainCheckDetails>;
  return {
    seq: e.seq, at: e.at.toISOString(), actor: e.actor, ok: d.ok === true,
    head_seq: typeof d.head_seq === "number" ? d.head_seq : null, head_hash: typeof d.head_hash === "string" ? d.head_hash : null, findings: Number(d.findings ?? 0),
  };
}

/**
 * The light check of a page view: rows in `scope` (without the original bytes) and the chain from the
 * newest verified head (recorded in the log by a full check, or verified earlier by this process) to now.
 * A clean result becomes this process's verified head. Never throws on a damaged or tampered database.
 */
export async function checkRecordsLight(opts: { scope?: ReadonlySet<string>; anchor?: Anchor; now?: Date } = {}) {
  let db: string | null;
  try {
    db = databaseUrl();
  } catch {
    db = null;
  }
  const last = await lastChainCheck();
  const logged: LightFrom | null =
    last && last.ok && last.head_seq !== null && last.head_hash !== null ? { head: { seq: last.head_seq, hash: last.head_hash }, source: "log", checked_at: last.at, entry: last.seq, actor: last.actor } : null;
  const mine = db ? verifiedHeads.get(db) ?? null : null;
  const from = logged && mine ? (mine.head.seq >= logged.head.seq ? mine : logged) : logged ?? mine;
  const { snapshot, storage } = await readRecordSnapshot({
    scope: opts.scope ?? new Set(),
    storageChecks: false,
    originals: false,
    chain: { fromSeq: from?.head.seq ?? 0, seqs: opts.anchor ? [opts.anchor.seq] : [] },
  });
  const local = localKey();
  if (validSignatures.size > 1_000_000) validSignatures.clear();
  const check = checkRecordsFrom(snapshot, from?.head ?? null, { localKeyFingerprint: local.fp, validSignatures });
  const findings = [...storage, ...check.findings];
  let anchor: VerifyReport["anchor"];
  if (opts.anchor) {
    const af = checkAnchor(snapshot.entries, check.keys, opts.anchor);
    findings.push(...af);
    anchor = { given: opts.anchor, contained: af.length === 0 };
  }
  const checked_at = (opts.now ?? new Date()).toISOString();
  if (db && findings.length === 0 && check.head) verifiedHeads.set(db, { head: { seq: check.head.seq, hash: check.head.hash }, source: "process", checked_at });
  const key: KeyStatus = { chain: check.keys.at(-1)?.fingerprint ?? null, local: local.fp, ...(local.note ? { note: local.note } : {}) };
  const entriesChecked = snapshot.entries.filter((e) => e.seq > (from?.head.seq ?? 0)).length;
  return { findings, head: check.head, key, anchor, checked_at, from, logged, entriesChecked };
}

/** The full check behind `corelag verify`: never throws on a damaged or tampered database; every problem is a finding. */
export async function verifyRecords(opts: { reviewId?: string; anchor?: Anchor; reproduce?: boolean } = {}): Promise<VerifyReport> {
  const r = await checkStoredRecords({ anchor: opts.anchor });
  const findings = [...r.findings];
  const reviews: ReproductionCheck[] = [];
  if (opts.reproduce !== false) {
    const ids = opts.reviewId ? [opts.reviewId] : r.snapshot.reviews.map((x) => x.id);
    for (const id of ids) {
      let rc: ReproductionCheck;
      try {
        rc = await verifyStoredReview(id);
      } catch (e) {
        rc = { id, title: "", reproduced: false, problems: [`cannot be re-run: ${(e as Error).message.split("\n")[0]}`] };
      }
      reviews.push(rc);
      for (const p of rc.problems) findings.push({ kind: "review-not-reproduced", table: "Review", row: id, message: `review ${id}: ${p}` });
    }
  }
  return { ok: findings.length === 0, checked_at: r.checked_at, head: r.head, key: r.key, findings, chain: verifyAuditChain(r.snapshot.entries), reviews, ...(r.anchor ? { anchor: r.anchor } : {}) };
}

/** The head to keep outside the database; null with a reason when there is nothing signed to anchor. */
export async function currentAnchor(now = new Date()): Promise<{ anchor: Anchor } | { anchor: null; reason: string; findings: Finding[] }> {
  const r = await checkStoredRecords({ storageChecks: false, now });
  const a = anchorOf(r.head, now);
  if (a) return { anchor: a };
  return { anchor: null, reason: r.head ? "the chain's newest entry is not signed by the key in force" : "the audit chain is empty", findings: r.findings };
}

export interface RecordVerification {
  ok: boolean;
  checked_at: string;
  head: ChainHead | null;
  key: KeyStatus;
  findings: Finding[];
  /** whether the whole chain and the original bytes were checked (else the light check, from `from`) */
  full: boolean;
  from?: LightFrom;
}

/**
 * The per-review check: this review and its inputs against the signed chain. `full` (the re-check, exports)
 * reads the whole chain and the trace's original bytes; the default (a page view) is the light check: the
 * chain from its last verified head, the rows without the original bytes (their stored SHA-256 stands in).
 */
export async function verifyReviewRecord(ids: { reviewId: string; traceId: string; productId: string; packId?: string | null; limitsId: string }, opts: { full?: boolean } = {}): Promise<RecordVerification> {
  const scope = new Set([ids.reviewId, ids.traceId, ids.productId, ids.limitsId, ...(ids.packId ? [ids.packId] : [])]);
  if (opts.full) {
    const r = await checkStoredRecords({ scope, storageChecks: false });
    return { ok: r.findings.length === 0, checked_at: r.checked_at, head: r.head, key: r.key, findings: r.findings, full: true };
  }
  const r = await checkRecordsLight({ scope });
  return { ok: r.findings.length === 0, checked_at: r.checked_at, head: r.head, key: r.key, findings: r.findings, full: false, ...(r.from ? { from: r.from } : {}) };
}

/**
 * "Re-check the whole chain now" on the audit page: the full check (storage, every entry, signature and
 * record, the original bytes against their SHA-256) recorded in the log, so that later page views verify
 * only the entries after it.
 */
export async function recordChainCheck(actor: Actor): Promise<{ report: Awaited<ReturnType<typeof checkStoredRecords>>; seq: number }> {
  const report = await checkStoredRecords();
  const details: ChainCheckDetails = {
    ok: report.findings.length === 0,
    head_seq: report.head?.seq ?? null,
    head_hash: report.head?.hash ?? null,
    key_fingerprint: report.head?.key_fingerprint ?? null,
    findings: report.findings.length,
    problems: report.findings.slice(0, 20).map((f) => f.message),
  };
  const entry = await logChainCheck(actor, details);
  return { report, seq: entry.seq };
}

/** `corelag anchor`: the current head, also noted in the local anchor log for the audit page. */
export async function takeAnchor(now = new Date()): ReturnType<typeof currentAnchor> {
  const r = await currentAnchor(now);
  if (r.anchor) recordAnchor(r.anchor);
  return r;
}

/** `corelag key rotate`: a key problem comes back as a message, not a crash. */
export async function rotateKey(actor: Actor): Promise<{ ok: true; from: string; to: string; seq: number } | { ok: false; message: string }> {
  try {
    return { ok: true, ...(await rotateSigningKey(actor)) };
  } catch (e) {
    if (e instanceof SigningKeyError) return { ok: false, message: e.message };
    throw e;
  }
}

/** `corelag seal`: content hashes for rows whose entries predate them; returns how many rows were sealed. */
export async function sealRows(actor: Actor): Promise<number> {
  return sealUnsealedRows(actor);
}

/** At start: the signing key exists (created beside the database if needed) and older rows are sealed. */
export async function prepareRecords(): Promise<{ fingerprint: string; source: string; sealed: number }> {
  const key = loadSigningKey({ create: true })!;
  return { fingerprint: key.fingerprint, source: key.source, sealed: await sealUnsealedRows(SYSTEM_ACTOR) };
}

export interface AnchorStatus {
  /** the newest anchor `corelag anchor` noted beside the database, if any */
  anchor: Anchor | null;
  /** does the chain still contain it, signed by the same key? */
  contained: boolean | null;
  findings: Finding[];
  head: ChainHead | null;
  key: KeyStatus;
  checked_at: string;
}

/** The audit page's anchor line: the last anchor taken here, checked against the chain as it is now. */
export async function lastAnchorStatus(): Promise<AnchorStatus> {
  let anchor: Anchor | null = null;
  try {
    anchor = lastRecordedAnchor();
  } catch {
    anchor = null;
  }
  // no rows are read (empty scope): only the chain from its last verified head, its signatures and the anchor
  const r = await checkRecordsLight({ ...(anchor ? { anchor } : {}) });
  const anchorFindings = r.findings.filter((f) => f.kind.startsWith("anchor-"));
  return { anchor, contained: anchor ? anchorFindings.length === 0 : null, findings: anchorFindings, head: r.head, key: r.key, checked_at: r.checked_at };
}


/**
 * Posts an anchor line to the configured webhook (CORELAG_ANCHOR_WEBHOOK), so a copy lands outside this
 * machine; returns what happened in words. Meant to run once a day (cron) with `corelag anchor --post`.
 */
export async function postAnchor(anchor: Anchor, url: string | undefined, timeout_ms = 10_000): Promise<{ ok: boolean; message: string }> {
  if (!url) return { ok: false, message: "CORELAG_ANCHOR_WEBHOOK is not set: there is nowhere to post the anchor" };
  try {
    const res = await fetch(url, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(anchor), signal: AbortSignal.timeout(timeout_ms) });
    return res.ok ? { ok: true, message: `posted to ${new URL(url).host} (HTTP ${res.status})` } : { ok: false, message: `the webhook answered HTTP ${res.status}` };
  } catch (e) {
    return { ok: false, message: `the webhook could not be reached: ${(e as Error).message}` };
  }
}
