import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { spawnSync } from "node:child_process";
import { ENGINE_VERSION } from "@/lib/review/runReview";
import { dropTriggerSql, testDatabaseUrl } from "../helpers/database";
import { TEST_ACTOR } from "../helpers/accounts";

// Review records on a real SQLite file: sign-off, immutability, the audit chain and reproduction.
const dir = mkdtempSync(path.join(tmpdir(), "corelag-rec-"));
const url = testDatabaseUrl(dir, "records.db");
process.env.DATABASE_URL = url;
const ROOT = path.resolve(__dirname, "../..");
const DEMO = path.join(ROOT, "public/demo");

let reviewId = "";
let ids: { traceId: string; productId: string; limitsId: string };

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  const { importCsv } = await import("@/lib/trace");
  const dbm = await import("@/lib/db");
  const bytes = readFileSync(path.join(DEMO, "route7-tote3.csv"));
  const traceId = await dbm.createTrace({ name: "rec", fileName: "route7-tote3.csv", bytes, imported: importCsv(bytes), actor: TEST_ACTOR });
  const p = await dbm.createDefinition("product", JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8")), TEST_ACTOR);
  const l = await dbm.createDefinition("limits", JSON.parse(readFileSync(path.join(DEMO, "ready-meal.limits.json"), "utf8")), TEST_ACTOR);
  ids = { traceId, productId: p.id, limitsId: l.id };
  const { runAndStoreReview } = await import("@/lib/services/reviews");
  const res = await runAndStoreReview({ title: "records", ...ids }, TEST_ACTOR);
  if (!res.ok) throw new Error(res.message);
  reviewId = res.reviewId;
});

afterAll(async () => {
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

function verifyCli(...args: string[]) {
  const r = spawnSync(process.execPath, [path.join(ROOT, "node_modules/tsx/dist/cli.mjs"), path.join(ROOT, "lib/cli/main.ts"), "verify", ...args], {
    cwd: ROOT,
    encoding: "utf8",
    env: { ...process.env, DATABASE_URL: url },
  });
  return { code: r.status, out: r.stdout ? JSON.parse(r.stdout) : null, stderr: r.stderr };
}

describe("review records", () => {
  it("records every create, import and run in the audit chain", async () => {
    const { listAudit } = await import("@/lib/db/audit");
    const entries = await listAudit();
    // the first write records the signing key in the chain
    expect(entries.map((e) => `${e.action} ${e.entity}`)).toEqual(["key key", "import trace", "create definition", "create definition", "run review"]);
    expect(entries[4]!.details).toMatchObject({ productId: ids.productId, limitsId: ids.limitsId, engineVersion: ENGINE_VERSION });
  });

  it("a stored review reproduces bit for bit (verify --review)", () => {
    const r = verifyCli("--review", reviewId);
    expect(r.code).toBe(0);
    expect(r.out).toMatchObject({ ok: true, chain: { ok: true, entries: 5 }, findings: [], reviews: [{ id: reviewId, reproduced: true, problems: [] }] });
  });

  it("signOff compares the decision with the STORED outcome: a forged 'suggested' field does not waive the comment", async () => {
    const { signOff } = await import("@/lib/services/reviews");
    const { getReview } = await import("@/lib/db/reviews");
    const stored = (await getReview(reviewId))!.outcome;
    const other = stored === "accept" ? "reject" : "accept";
    // what a forged form posts: the decision, and a "suggested" that agrees with it (ignored by the schema)
    const forged = { reviewer: "Dana Ruiz", decision: other, suggested: other } as Parameters<typeof signOff>[1];
    expect(await signOff(reviewId, forged, TEST_ACTOR)).toEqual({ ok: false, reason: "comment-required", message: "a decision that differs from the suggested outcome needs a comment saying why" });
    expect(await signOff(reviewId, { reviewer: "Dana Ruiz", decision: other, comment: "ok" }, TEST_ACTOR)).toMatchObject({ ok: false, reason: "comment-required" });
    const after = (await getReview(reviewId))!;
    expect(after.status).toBe("open");
    expect(after.decision).toBeNull();
  });

  it("a signed review refuses edits, in the code and in the database", async () => {
    const { signOff } = await import("@/lib/services/reviews");
    const { renameReview } = await import("@/lib/db/reviews");
    const { db } = await import("@/lib/db/client");
    expect(await signOff(reviewId, { reviewer: "Dana Ruiz", decision: "hold", comment: "core estimate near the limit; probe the pallet" }, TEST_ACTOR)).toEqual({ ok: true });
    expect(await renameReview(reviewId, "changed", TEST_ACTOR)).toMatchObject({ ok: false, reason: "signed" });
    expect(await signOff(reviewId, { reviewer: "Someone Else", decision: "accept" }, TEST_ACTOR)).toMatchObject({ ok: false, reason: "signed" });
    // The triggers abort the statement (the driver adapter reports a trigger abort as a constraint violation).
    await expect(db.review.update({ where: { id: reviewId }, data: { title: "sneaky" } })).rejects.toThrow();
    await expect(db.review.delete({ where: { id: reviewId } })).rejects.toThrow();
    expect((await db.review.findUnique({ where: { id: reviewId } }))!.title).toBe("records");
  });

  it("the review.json export carries the sign-off's meaning and the record check against the signed chain head", async () => {
    const { exportReview } = await import("@/lib/services/exports");
    const { listAudit } = await import("@/lib/db/audit");
    const { keyFingerprint } = await import("@/lib/review/signature");
    const { createPrivateKey } = await import("node:crypto");
    const entries = await listAudit();
    const out = await exportReview(reviewId, "review.json", TEST_ACTOR);
    if (!out.ok) throw new Error(out.message);
    const json = JSON.parse(out.body) as { sign_off: { meaning: string }; record_check: Record<string, unknown> };
    expect(json.sign_off.meaning).toBe("I reviewed this record; the decision above is mine");
    expect(json.record_check).toMatchObject({
      verified: true,
      chain_head: { seq: entries.length, hash: entries.at(-1)!.hash },
      // the key file beside the database (created at the first write)
      key_fingerprint: keyFingerprint(createPrivateKey(readFileSync(`${path.join(dir, "records.db")}.key`, "utf8"))),
      findings: [],
    });
  });

  it("a correction is a new review that points back at the signed one", async () => {
    const { runAndStoreReview } = await import("@/lib/services/reviews");
    const { getReview } = await import("@/lib/db/reviews");
    const res = await runAndStoreReview({ title: "records (correction)", ...ids, model: "lumped", correctsId: reviewId }, TEST_ACTOR);
    expect(res.ok).toBe(true);
    const original = await getReview(reviewId);
    expect(original!.correctedBy.map((c) => c.title)).toEqual(["records (correction)"]);
    expect(original!.status).toBe("signed");
  });

  it("a definition keeps every digit of its numbers, so its stored SHA-256 still matches and verify stays quiet", async () => {
    const dbm = await import("@/lib/db");
    const { canonicalJson } = await import("@/lib/review/canonical");
    const { sha256Hex } = await import("@/lib/trace/hash");
    // 0.1 + 0.2 = 0.30000000000000004 in IEEE 754 doubles; the other is a fitted value with 20 significant digits
    const body = { name: "full precision", a: 0.1 + 0.2, b: 0.0069124423963133645 };
    const d = await dbm.createDefinition("profile", body, TEST_ACTOR);
    const back = (await dbm.getDefinition<typeof body>(d.id))!;
    expect(back.body.a).toBe(0.30000000000000004);
    expect(back.body.b).toBe(0.0069124423963133645);
    expect(sha256Hex(canonicalJson(back.body))).toBe(back.sha256);
    const r = verifyCli();
    expect(r.out.findings).toEqual([]);
    expect(r.code).toBe(0);
  });

  it("a stored review's result is stored exactly: it hashes, with the stored core series, to its resultSha256", async () => {
    const { db } = await import("@/lib/db/client");
    const { resultHash } = await import("@/lib/review/canonical");
    const { bytesToFloat64 } = await import("@/lib/db/bytes");
    const row = (await db.review.findUnique({ where: { id: reviewId } }))!;
    expect(resultHash(row.result, bytesToFloat64(row.coreC))).toBe(row.resultSha256);
  });

  it("a page view's light check starts from the last recorded full check and leaves the original bytes in the database", async () => {
    const { verifyReviewRecord, recordChainCheck, checkRecordsLight, lastChainCheck } = await import("@/lib/services/verify");
    const { db } = await import("@/lib/db/client");
    const rid = { reviewId, ...ids };
    // the audit page's full check, recorded in the log: it vouches for the chain up to the entry before it
    const { report, seq } = await recordChainCheck(TEST_ACTOR);
    expect(report.findings).toEqual([]);
    expect(await lastChainCheck()).toMatchObject({ seq, ok: true, head_seq: seq - 1, actor: "system:test" });
    const light = await checkRecordsLight();
    expect(light.findings).toEqual([]);
    expect(light.from).toMatchObject({ source: "log", entry: seq, head: { seq: seq - 1, hash: report.head!.hash } });
    expect(light.entriesChecked).toBe(1); // only the check's own entry
    expect(light.head!.seq).toBe(seq);
    // the next view starts where this process last found the chain intact
    expect((await checkRecordsLight()).from).toMatchObject({ source: "process", head: { seq } });
    expect(await verifyReviewRecord(rid)).toMatchObject({ ok: true, full: false, head: { seq } });
    // The original bytes changed behind the application's back, the SHA-256 column left as it was: the page's
    // light check does not read the bytes (so it cannot see this); the full check (re-check, verify) does.
    await db.$executeRawUnsafe(dropTriggerSql("Trace_no_update", "Trace"));
    const original = (await db.trace.findUnique({ where: { id: ids.traceId }, select: { original: true } }))!.original;
    try {
      await db.$executeRaw`UPDATE "Trace" SET "original" = ${new Uint8Array([0])} WHERE "id" = ${ids.traceId}`;
      expect((await verifyReviewRecord(rid)).ok).toBe(true);
      const full = await verifyReviewRecord(rid, { full: true });
      expect(full.findings.map((f) => f.kind).sort()).toEqual(["row-altered", "stored-hash-mismatch"]);
    } finally {
      await db.$executeRaw`UPDATE "Trace" SET "original" = ${original} WHERE "id" = ${ids.traceId}`;
    }
    expect((await verifyReviewRecord(rid, { full: true })).ok).toBe(true);
  });

  it("the database refuses to change or delete audit entries", async () => {
    const { db } = await import("@/lib/db/client");
    await expect(db.auditEntry.update({ where: { seq: 1 }, data: { actor: "x" } })).rejects.toThrow();
    await expect(db.auditEntry.delete({ where: { seq: 1 } })).rejects.toThrow();
    expect((await db.auditEntry.findUnique({ where: { seq: 2 } }))!.actor).toBe("system:test");
  });

  it("verify detects an audit entry changed behind the database's back", async () => {
    const { db } = await import("@/lib/db/client");
    // Someone with direct access to the file drops the guard and edits an entry.
    await db.$executeRawUnsafe(dropTriggerSql("AuditEntry_no_update", "AuditEntry"));
    await db.$executeRawUnsafe(`UPDATE "AuditEntry" SET "actor" = 'mallory' WHERE "seq" = 3`);
    const r = verifyCli();
    expect(r.code).toBe(1);
    expect(r.out.ok).toBe(false);
    expect(r.out.chain.problems).toHaveLength(1);
    expect(r.out.chain.problems[0]).toMatch(/^entry 3 \(create definition \S+\): its content no longer matches its hash$/);
    expect(r.out.findings).toEqual([{ kind: "entry-altered", table: "AuditEntry", entry: 3, message: r.out.chain.problems[0] }]);
  });
});
