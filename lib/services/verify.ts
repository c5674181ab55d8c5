// `corelag verify` and the app's "verified at" line: storage checks, the chain and its signatures, every
// row against its latest audit entry, an optional external anchor, and (CLI) re-running stored reviews.
import { readRecordSnapshot } from "../db/recordSnapshot";
export { postgresDatabaseProblem } from "../db/presence";
export { backupDatabase, restoreDatabase, BackupError } from "../db/backup";
import { loadSigningKey, SigningKeyError } from "../db/signingKey";
import { lastRecordedAnchor, recordAnchor } from "../db/anchorLog";
import { rotateSigningKey, sealUnsealedRows } from "../db/audit";
import { checkRecords, type ChainHead, type Finding } from "../review/records";
import { checkAnchor, anchorOf, type Anchor } from "../review/anchor";
import { verifyAuditChain, type ChainCheck } from "../review/audit";
import { verifyStoredReview, type ReproductionCheck } from "./reviews";

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
}

/** The app's per-review check: the chain and signatures whole, this review and its inputs against it. */
export async function verifyReviewRecord(ids: { reviewId: string; traceId: string; productId: string; packId?: string | null; limitsId: string }): Promise<RecordVerification> {
  const scope = new Set([ids.reviewId, ids.traceId, ids.productId, ids.limitsId, ...(ids.packId ? [ids.packId] : [])]);
  const r = await checkStoredRecords({ scope, storageChecks: false });
  return { ok: r.findings.length === 0, checked_at: r.checked_at, head: r.head, key: r.key, findings: r.findings };
}

/** `corelag anchor`: the current head, also noted in the local anchor log for the audit page. */
export async function takeAnchor(now = new Date()): ReturnType<typeof currentAnchor> {
  const r = await currentAnchor(now);
  if (r.anchor) recordAnchor(r.anchor);
  return r;
}

/** `corelag key rotate`: a key problem comes back as a message, not a crash. */
export async function rotateKey(actor = "cli"): Promise<{ ok: true; from: string; to: string; seq: number } | { ok: false; message: string }> {
  try {
    return { ok: true, ...(await rotateSigningKey(actor)) };
  } catch (e) {
    if (e instanceof SigningKeyError) return { ok: false, message: e.message };
    throw e;
  }
}

/** `corelag seal`: content hashes for rows whose entries predate them; returns how many rows were sealed. */
export async function sealRows(actor = "cli"): Promise<number> {
  return sealUnsealedRows(actor);
}

/** At start: the signing key exists (created beside the database if needed) and older rows are sealed. */
export async function prepareRecords(): Promise<{ fingerprint: string; source: string; sealed: number }> {
  const key = loadSigningKey({ create: true })!;
  return { fingerprint: key.fingerprint, source: key.source, sealed: await sealUnsealedRows("system") };
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
  // no rows are read (empty scope): only the chain, its signatures and the anchor
  const r = await checkStoredRecords({ scope: new Set(), storageChecks: false, ...(anchor ? { anchor } : {}) });
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
