import { describe, it, expect } from "vitest";
import { createHash, createPrivateKey, createPublicKey, generateKeyPairSync, sign, type KeyObject } from "node:crypto";
import { keyFingerprint, publicKeyText, rawPublicKey, shortFingerprint, signEntry, verifyEntrySignature } from "@/lib/review/signature";
import { isoInstant, reviewContentHash, type ReviewRowContent } from "@/lib/review/content";
import { auditHash, GENESIS_HASH, type AuditEntryRecord } from "@/lib/review/audit";
import { checkRecords, checkRecordsFrom, signatureFindings, type RecordSnapshot, type SignatureRecord } from "@/lib/review/records";
import { checkAnchor, keyInForce, anchorOf } from "@/lib/review/anchor";

// RFC 8032, section 7.1, TEST 1 (Ed25519, empty message).
const RFC_SEED = "9d61b19deffd5a60ba844af492ec2cc44449c5697b326919703bac031cae7f60";
const RFC_PUBLIC = "d75a980182b10ab7d54bfed3c964073a0ee172f3daa62325af021a68f707511a";
const RFC_SIGNATURE = "e5564300c360ac729086e2cc806e828a84877f1eb8e5d974d873e065224901555fb8821590a33bacc61e39701cf9b46bd25bf5f0595bbe24655141438e7a100b";
const rfcKey = createPrivateKey({ key: Buffer.concat([Buffer.from("302e020100300506032b657004220420", "hex"), Buffer.from(RFC_SEED, "hex")]), format: "der", type: "pkcs8" });

describe("signature (Ed25519 with node:crypto)", () => {
  it("rawPublicKey and sign reproduce RFC 8032 test 1", () => {
    expect(rawPublicKey(rfcKey).toString("hex")).toBe(RFC_PUBLIC);
    expect(sign(null, Buffer.alloc(0), rfcKey).toString("hex")).toBe(RFC_SIGNATURE);
  });
  it("keyFingerprint is the SHA-256 of the raw public key; shortFingerprint groups its first 16 digits", () => {
    const fp = keyFingerprint(rfcKey);
    expect(fp).toBe(createHash("sha256").update(Buffer.from(RFC_PUBLIC, "hex")).digest("hex"));
    expect(keyFingerprint(createPublicKey(rfcKey))).toBe(fp);
    expect(shortFingerprint(fp)).toMatch(/^[0-9a-f]{4} [0-9a-f]{4} [0-9a-f]{4} [0-9a-f]{4}$/);
  });
  it("verifyEntrySignature accepts the signed (seq, hash) and nothing else", () => {
    const hash = "ab".repeat(32);
    const s = signEntry(rfcKey, 7, hash);
    expect(verifyEntrySignature(createPublicKey(rfcKey), 7, hash, s)).toBe(true);
    expect(verifyEntrySignature(createPublicKey(rfcKey), 8, hash, s)).toBe(false);
    expect(verifyEntrySignature(createPublicKey(rfcKey), 7, "cd".repeat(32), s)).toBe(false);
    expect(verifyEntrySignature(createPublicKey(rfcKey), 7, hash, "not base64 at all")).toBe(false);
  });
});

const review: ReviewRowContent = {
  id: "r1", title: "t", traceId: "t1", productId: "p1", packId: null, limitsId: "l1", options: { model: "auto" }, engineVersion: "0.3.0",
  result: { outcome: "reject", rules: [{ id: "a", status: "fail" }] }, coreC: new Uint8Array(16), surfaceC: null, meanC: null, coolantC: null,
  resultSha256: "0".repeat(64), outcome: "reject", status: "signed", signedBy: "Dana Ruiz", signedAt: new Date("2026-06-17T08:00:00.000Z"),
  decision: "reject", signComment: "too warm", signMeaning: "I reviewed this record", correctsId: null, createdAt: new Date("2026-06-17T07:00:00.000Z"),
};

describe("content hashes", () => {
  it("isoInstant gives one text for one instant, whatever form the database kept", () => {
    expect(isoInstant("2026-12-02T07:03:58.502+00:00")).toBe("2026-12-02T07:03:58.502Z");
    expect(isoInstant(new Date(Date.UTC(2026, 11, 2, 7, 3, 58, 502)))).toBe("2026-12-02T07:03:58.502Z");
    expect(isoInstant("not a date")).toBe("invalid:not a date");
  });
  it("reviewContentHash changes with every sign-off field, every rule status and every stored series", () => {
    const base = reviewContentHash(review);
    expect(reviewContentHash({ ...review, signedAt: "2026-06-17T08:00:00.000+00:00" })).toBe(base);
    const variants: Partial<ReviewRowContent>[] = [
      { decision: "accept" }, { signedBy: "Someone" }, { signedAt: new Date("2026-06-17T08:00:01Z") }, { signMeaning: "approved" }, { signComment: "fine" },
      { status: "open" }, { outcome: "accept" }, { result: { outcome: "reject", rules: [{ id: "a", status: "pass" }] } },
      { coreC: new Uint8Array(16).fill(1) }, { meanC: new Uint8Array(8) }, { title: "other" },
    ];
    for (const v of variants) expect(reviewContentHash({ ...review, ...v })).not.toBe(base);
  });
});

/** A signed chain made in memory: a key entry, then n plain entries. */
function chain(key: KeyObject, n: number): { entries: AuditEntryRecord[]; signatures: SignatureRecord[] } {
  const fp = keyFingerprint(key);
  const entries: AuditEntryRecord[] = [];
  const signatures: SignatureRecord[] = [];
  let prev = GENESIS_HASH;
  const add = (action: string, entity: string, entityId: string, details: unknown, signer: KeyObject) => {
    const f = { seq: entries.length + 1, at: new Date(Date.UTC(2026, 0, 1, 0, entries.length)), action, entity, entityId, actor: "cli", details, prevHash: prev };
    const hash = auditHash(f);
    entries.push({ ...f, hash });
    signatures.push({ seq: f.seq, keyFingerprint: keyFingerprint(signer), signature: signEntry(signer, f.seq, hash) });
    prev = hash;
  };
  add("key", "key", fp, { fingerprint: fp, publicKey: publicKeyText(key), previous: null }, key);
  for (let i = 0; i < n; i++) add("export", "review", `r${i}`, { i }, key);
  return { entries, signatures };
}

describe("signatureFindings and anchors", () => {
  const k1 = generateKeyPairSync("ed25519").privateKey;
  it("a signed chain passes; the memo does not hide a changed signature", () => {
    const { entries, signatures } = chain(k1, 3);
    const memo = new Set<string>();
    expect(signatureFindings(entries, signatures, memo).findings).toEqual([]);
    expect(memo.size).toBe(4);
    const forged = signatures.map((s) => (s.seq === 3 ? { ...s, signature: signatures[1]!.signature } : s));
    expect(signatureFindings(entries, forged, memo).findings.map((f) => [f.kind, f.entry])).toEqual([["signature-invalid", 3]]);
  });
  it("keyInForce: the first key signs its own entry, a rotation entry is signed by the outgoing key", () => {
    const keys = [{ fingerprint: "A", fromSeq: 1 }, { fingerprint: "B", fromSeq: 5 }];
    expect([1, 2, 5, 6].map((s) => keyInForce(keys, s))).toEqual(["A", "A", "A", "B"]);
  });
  it("checkAnchor: contained, truncated, rewritten, another chain", () => {
    const { entries, signatures } = chain(k1, 4);
    // scoped to no rows: only the chain, its signatures and the anchor are checked
    const check = checkRecords({ entries, signatures, traces: [], definitions: [], reviews: [], incompleteTables: [], scope: new Set() });
    expect(check.findings).toEqual([]);
    const anchor = anchorOf(check.head, new Date("2026-02-01T00:00:00Z"))!;
    expect(anchor).toMatchObject({ seq: 5, hash: entries[4]!.hash, key_fingerprint: keyFingerprint(k1), chain: entries[0]!.hash });
    expect(checkAnchor(entries, check.keys, anchor)).toEqual([]);
    expect(checkAnchor(entries.slice(0, 3), check.keys, anchor).map((f) => f.kind)).toEqual(["anchor-missing"]);
    expect(checkAnchor(entries, check.keys, { ...anchor, hash: "e".repeat(64) }).map((f) => f.kind)).toEqual(["anchor-rewritten"]);
    expect(checkAnchor(entries, check.keys, { ...anchor, key_fingerprint: "d".repeat(64) }).map((f) => f.kind)).toEqual(["anchor-key"]);
    expect(checkAnchor(chain(generateKeyPairSync("ed25519").privateKey, 4).entries, check.keys, anchor).map((f) => f.kind)).toEqual(["anchor-foreign"]);
  });
  it("an unsigned chain and a missing signature are findings", () => {
    const { entries, signatures } = chain(k1, 2);
    expect(signatureFindings(entries.slice(1), []).findings.map((f) => f.kind)).toEqual(["chain-unsigned"]);
    expect(signatureFindings(entries, signatures.slice(0, 2)).findings.map((f) => [f.kind, f.entry])).toEqual([["entry-unsigned", 3]]);
  });
});

describe("checkRecordsFrom: the light check of a page view, from a verified head", () => {
  const k1 = generateKeyPairSync("ed25519").privateKey;
  /** what the reader gives a light check from `from`: the tail from it, entry 1 and every key entry */
  const part = (c: { entries: AuditEntryRecord[]; signatures: SignatureRecord[] }, from: number): RecordSnapshot => {
    const keep = c.entries.filter((e) => e.seq >= from || e.seq === 1 || e.action === "key");
    const seqs = new Set(keep.map((e) => e.seq));
    return { entries: keep, signatures: c.signatures.filter((x) => seqs.has(x.seq) || x.seq >= from), traces: [], definitions: [], reviews: [], incompleteTables: [], scope: new Set(), partial: { fromSeq: from } };
  };

  it("an intact tail after the verified head passes and gives the same head as the full check", () => {
    const c = chain(k1, 9); // entries 1 (key) … 10
    const full = checkRecords({ ...c, traces: [], definitions: [], reviews: [], incompleteTables: [], scope: new Set() });
    const light = checkRecordsFrom(part(c, 6), { seq: 6, hash: c.entries[5]!.hash });
    expect(light.findings).toEqual([]);
    expect(light.head).toEqual(full.head);
  });

  it("a chain rewritten up to the verified head (re-hashed by a forger) fails: the head's hash differs", () => {
    const c = chain(k1, 9);
    const verified = { seq: 6, hash: c.entries[5]!.hash };
    // the forger re-builds the chain with other details, re-hashing and re-signing with their own key
    const forged = chain(generateKeyPairSync("ed25519").privateKey, 9);
    const kinds = checkRecordsFrom(part(forged, 6), verified).findings.map((f) => [f.kind, f.entry]);
    expect(kinds).toContainEqual(["chain-broken", 6]);
  });

  it("an entry after the head altered, unlinked or unsigned is found; an entry before it altered without re-hashing is left to the full check", () => {
    const c = chain(k1, 9);
    const verified = { seq: 6, hash: c.entries[5]!.hash };
    const altered = { ...c, entries: c.entries.map((e) => (e.seq === 8 ? { ...e, details: { i: 99 } } : e)) };
    expect(checkRecordsFrom(part(altered, 6), verified).findings.map((f) => [f.kind, f.entry])).toEqual([["entry-altered", 8]]);
    const unsigned = { ...c, signatures: c.signatures.filter((x) => x.seq !== 9) };
    expect(checkRecordsFrom(part(unsigned, 6), verified).findings.map((f) => [f.kind, f.entry])).toEqual([["entry-unsigned", 9]]);
    const gap = { ...c, entries: c.entries.filter((e) => e.seq !== 8) };
    expect(checkRecordsFrom(part(gap, 6), verified).findings.map((f) => f.kind)).toContain("chain-broken");
    // entry 3 changed in place (not re-hashed): not in the light check's part, so not seen here…
    const old = { ...c, entries: c.entries.map((e) => (e.seq === 3 ? { ...e, details: { i: 77 } } : e)) };
    expect(checkRecordsFrom(part(old, 6), verified).findings).toEqual([]);
    // …but the full check finds it
    expect(checkRecords({ ...old, traces: [], definitions: [], reviews: [], incompleteTables: [], scope: new Set() }).findings.map((f) => [f.kind, f.entry])).toEqual([["entry-altered", 3]]);
  });

  it("a key entry before the head with its public key swapped (not re-hashed) is found: every key entry is read and hashed", () => {
    const c = chain(k1, 9);
    const other = generateKeyPairSync("ed25519").privateKey;
    const swapped = { ...c, entries: c.entries.map((e) => (e.seq === 1 ? { ...e, details: { ...(e.details as object), publicKey: publicKeyText(other) } } : e)) };
    const kinds = checkRecordsFrom(part(swapped, 6), { seq: 6, hash: c.entries[5]!.hash }).findings.map((f) => f.kind);
    expect(kinds).toContain("entry-altered");
  });
});
