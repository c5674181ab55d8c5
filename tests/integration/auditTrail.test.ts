import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { createHash } from "node:crypto";
import { dropTriggerSql, testDatabaseUrl } from "../helpers/database";
import { TEST_ACTOR } from "../helpers/accounts";
import type { Actor } from "../../lib/access/actor";

/** The signer of the test's signed review: a user, so the audit log names her (and a search for "vintner" finds the entry). */
const ADA: Actor = { kind: "user", userId: "u-ada", name: "Ada Vintner", email: "ada@example.com", role: "reviewer" };

// What an auditor and a QA reviewer read back, on a real SQLite file: the audit log with names, links,
// filters, pages and CSV; the original file; re-checks; findings with the sign-off; lists and attention.
const dir = mkdtempSync(path.join(tmpdir(), "corelag-audit-"));
const url = testDatabaseUrl(dir, "audit.db");
process.env.DATABASE_URL = url;
const DEMO = path.join(__dirname, "../../public/demo");
const sha = (b: Uint8Array | string) => createHash("sha256").update(b).digest("hex");

let ids: { traceId: string; otherTraceId: string; productId: string; limitsId: string; reviewId: string; signedId: string };
const routeBytes = readFileSync(path.join(DEMO, "route7-tote3.csv"));

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  const { importCsv } = await import("@/lib/trace");
  const dbm = await import("@/lib/db");
  const { runAndStoreReview, signOff } = await import("@/lib/services/reviews");
  const traceId = await dbm.createTrace({ name: "Route seven tote three", fileName: "route7-tote3.csv", bytes: routeBytes, imported: importCsv(routeBytes), actor: TEST_ACTOR });
  const probe = readFileSync(path.join(DEMO, "probe-test.csv"));
  const otherTraceId = await dbm.createTrace({ name: "Probe test", fileName: "probe-test.csv", bytes: probe, imported: importCsv(probe), actor: TEST_ACTOR });
  const p = await dbm.createDefinition("product", JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8")), TEST_ACTOR);
  // a name a spreadsheet would run as a formula
  const l = await dbm.createDefinition("limits", { ...JSON.parse(readFileSync(path.join(DEMO, "ready-meal.limits.json"), "utf8")), name: "=HYPERLINK(\"http://x\")" }, TEST_ACTOR);
  const a = await runAndStoreReview({ title: "Open one", traceId, productId: p.id, limitsId: l.id }, TEST_ACTOR);
  const b = await runAndStoreReview({ title: "Signed one", traceId, productId: p.id, limitsId: l.id }, TEST_ACTOR);
  if (!a.ok || !b.ok) throw new Error("review failed");
  const outcome = (await dbm.getReview(b.reviewId))!.outcome as "accept" | "hold" | "reject";
  const decision = outcome === "hold" ? "reject" : "hold";
  const signed = await signOff(b.reviewId, { reviewer: "Ada Vintner", decision, comment: "probe the pallet, then decide" }, ADA);
  if (!signed.ok) throw new Error(signed.message);
  ids = { traceId, otherTraceId, productId: p.id, limitsId: l.id, reviewId: a.reviewId, signedId: b.reviewId };
});

afterAll(async () => {
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

describe("audit log queries", () => {
  it("queryAudit gives each entry its object's name, link and raw id, newest first", async () => {
    const { queryAudit } = await import("@/lib/db/auditQueries");
    const page = await queryAudit();
    // entries in order written: the signing key, 2 imports, 2 definitions, 2 runs, 1 sign-off
    expect(page.total).toBe(8);
    expect(page.rows.map((e) => e.seq)).toEqual([8, 7, 6, 5, 4, 3, 2, 1]);
    const bySeq = new Map(page.rows.map((e) => [e.seq, e]));
    expect(bySeq.get(1)!.subject).toEqual({ name: `signing key ${bySeq.get(1)!.entityId.slice(0, 16)}…`, href: null });
    expect(bySeq.get(2)!.subject).toEqual({ name: "Route seven tote three", href: `/traces/${ids.traceId}` });
    expect(bySeq.get(2)!.entityId).toBe(ids.traceId);
    expect(bySeq.get(4)!.subject).toEqual({ name: "Ready meal tray 450 g (in tote) v1", kind: "product", href: `/definitions/${ids.productId}` });
    expect(bySeq.get(8)!.subject).toEqual({ name: "Signed one", href: `/reviews/${ids.signedId}` });
  });

  it("queryAudit filters by kind, action, object and date, and searches names, hashes and people", async () => {
    const { queryAudit } = await import("@/lib/db/auditQueries");
    expect((await queryAudit({ entity: "definition" })).rows.map((e) => e.seq)).toEqual([5, 4]);
    expect((await queryAudit({ action: "sign" })).rows.map((e) => e.actor)).toEqual(["Ada Vintner <ada@example.com>"]);
    expect((await queryAudit({ object: ids.signedId })).rows.map((e) => e.action)).toEqual(["sign", "run"]);
    const now = Date.now();
    expect((await queryAudit({ from: new Date(now - 3600_000), to: new Date(now + 3600_000) })).total).toBe(8);
    expect((await queryAudit({ from: new Date(now + 86_400_000) })).total).toBe(0);
    expect((await queryAudit({ to: new Date(now - 86_400_000) })).total).toBe(0);
    // by a review's title, case-insensitively: its run and its sign-off
    expect((await queryAudit({ q: "SIGNED ONE" })).rows.map((e) => e.action)).toEqual(["sign", "run"]);
    // by the start of a trace's SHA-256
    expect((await queryAudit({ q: sha(routeBytes).slice(0, 12) })).rows.map((e) => e.entityId)).toEqual([ids.traceId]);
    expect((await queryAudit({ q: "vintner" })).rows.map((e) => e.action)).toEqual(["sign"]);
    expect((await queryAudit({ q: "nothing like this" })).total).toBe(0);
    // LIKE wildcards are searched as text
    expect((await queryAudit({ q: "%" })).total).toBe(0);
    expect((await queryAudit({ q: "_" })).total).toBe(0);
    // a formula-like name is found by its own characters, quote included
    expect((await queryAudit({ q: '=HYPERLINK("' })).rows.map((e) => e.entityId)).toEqual([ids.limitsId]);
  });

  it("queryAudit pages through the log without loading it all", async () => {
    const { queryAudit } = await import("@/lib/db/auditQueries");
    const p1 = await queryAudit({ pageSize: 3 });
    const p3 = await queryAudit({ pageSize: 3, page: 3 });
    expect([p1.pages, p1.rows.map((e) => e.seq)]).toEqual([3, [8, 7, 6]]);
    expect([p3.page, p3.rows.map((e) => e.seq)]).toEqual([3, [2, 1]]);
    // a page past the end gives the last page
    expect((await queryAudit({ pageSize: 3, page: 99 })).page).toBe(3);
  });

  it("the audit CSV keeps raw ids, links and hashes, batches the log in order, and neutralises formula-like names", async () => {
    const { auditBatches } = await import("@/lib/db/auditQueries");
    const { auditCsvHeader, auditCsvRow } = await import("@/lib/review/auditCsv");
    const rows: string[] = [];
    const sizes: number[] = [];
    for await (const batch of auditBatches({}, 2)) {
      sizes.push(batch.length);
      rows.push(...batch.map((e) => auditCsvRow(e, "http://host")));
    }
    expect(sizes).toEqual([2, 2, 2, 2]);
    expect(auditCsvHeader()).toBe("seq,at_utc,action,entity,entity_id,kind,name,link,export_format,actor,details_json,prev_hash,hash");
    expect(rows.map((r) => Number(r.split(",")[0]))).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
    const limitsRow = rows[4]!;
    expect(limitsRow).toContain(`,definition,${ids.limitsId},limits,"'=HYPERLINK(""http://x"") v1",http://host/definitions/${ids.limitsId},`);
    expect(rows[0]).toMatch(/,[0-9a-f]{64},[0-9a-f]{64}$/);
  });
});

describe("the original logger file", () => {
  it("getTrace leaves the original bytes out; getTraceOriginal returns them exactly, with their SHA-256", async () => {
    const { getTrace, getTraceOriginal } = await import("@/lib/db/traces");
    const t = (await getTrace(ids.traceId))!;
    expect("original" in t).toBe(false);
    const o = (await getTraceOriginal(ids.traceId))!;
    expect(Buffer.compare(Buffer.from(o.bytes), routeBytes)).toBe(0);
    expect(o).toMatchObject({ fileName: "route7-tote3.csv", sha256: sha(routeBytes) });
  });

  it("tracesWithSha256 finds the stored trace with the same bytes (the upload warning)", async () => {
    const { tracesWithSha256 } = await import("@/lib/db/traces");
    expect((await tracesWithSha256(sha(routeBytes).toUpperCase())).map((t) => t.id)).toEqual([ids.traceId]);
    expect(await tracesWithSha256(sha(routeBytes), ids.traceId)).toEqual([]);
    expect(await tracesWithSha256("0".repeat(64))).toEqual([]);
  });
});

describe("re-check a review", () => {
  it("recheckReview reproduces a stored review and records the result in the audit log", async () => {
    const { recheckReview } = await import("@/lib/services/recheck");
    const { lastAuditEntry } = await import("@/lib/db/auditQueries");
    const out = await recheckReview(ids.signedId, TEST_ACTOR);
    expect(out).toMatchObject({ ok: true, check: { reproduced: true, problems: [] } });
    const entry = (await lastAuditEntry(ids.signedId, "verify"))!;
    expect(entry).toMatchObject({ action: "verify", entity: "review", entityId: ids.signedId, details: { reproduced: true, problems: [] } });
    expect(entry.seq).toBe((out as { seq: number }).seq);
  });

  it("recheckReview says so, and records it, when the stored original bytes were changed", async () => {
    const { recheckReview } = await import("@/lib/services/recheck");
    const { queryAudit } = await import("@/lib/db/auditQueries");
    const { verifyAuditChain } = await import("@/lib/review/audit");
    const { listAudit } = await import("@/lib/db/audit");
    const { db } = await import("@/lib/db/client");
    const otherBytes = readFileSync(path.join(DEMO, "probe-test.csv"));
    // tamper with the probe-test trace's bytes behind the application's back, review it first
    const { runAndStoreReview } = await import("@/lib/services/reviews");
    const r = await runAndStoreReview({ title: "Probe trace review", traceId: ids.otherTraceId, productId: ids.productId, limitsId: ids.limitsId }, TEST_ACTOR);
    if (!r.ok) throw new Error(r.message);
    const changed = Buffer.from(otherBytes);
    changed[changed.length - 3] = changed[changed.length - 3] === 0x31 ? 0x32 : 0x31;
    // behind the application's back: drop the trigger that refuses changes to a trace, as a raw SQL client could
    await db.$executeRawUnsafe(dropTriggerSql("Trace_no_update", "Trace"));
    await db.trace.update({ where: { id: ids.otherTraceId }, data: { original: new Uint8Array(changed) } });
    const out = await recheckReview(r.reviewId, TEST_ACTOR);
    expect(out.ok && out.check.reproduced).toBe(false);
    expect(out.ok && out.check.problems).toContain("the trace's original bytes no longer match their SHA-256");
    expect((await queryAudit({ action: "verify", object: r.reviewId })).rows[0]!.details).toMatchObject({ reproduced: false });
    // the chain itself is intact: the change is in the trace row, which the re-check names
    expect(verifyAuditChain(await listAudit()).ok).toBe(true);
    expect(await recheckReview("no-such-review", TEST_ACTOR)).toEqual({ ok: false, message: "that review does not exist" });
  });
});

describe("exports and lists", () => {
  it("the findings CSV carries the sign-off decision, comment, reviewer and time", async () => {
    const { exportReview } = await import("@/lib/services/exports");
    const { getReview } = await import("@/lib/db/reviews");
    const signed = (await getReview(ids.signedId))!;
    const out = await exportReview(ids.signedId, "findings.csv", TEST_ACTOR);
    if (!out.ok) throw new Error(out.message);
    const lines = out.body.split("\r\n");
    expect(lines).toContain("status,signed");
    expect(lines).toContain(`decision,${signed.decision}`);
    expect(lines).toContain("decision_comment,\"probe the pallet, then decide\"");
    expect(lines).toContain("signed_by,Ada Vintner");
    expect(lines).toContain(`signed_at_utc,${signed.signedAt!.toISOString()}`);
    expect(signed.signMeaning).toBeTruthy();
    expect(lines.filter((l) => l.startsWith("signature_meaning,"))).toHaveLength(1);
    expect(lines.find((l) => l.startsWith("signature_meaning,"))!.length).toBeGreaterThan("signature_meaning,".length);
    expect(lines).toContain(`suggested_outcome,${signed.outcome}`);
    const open = await exportReview(ids.reviewId, "findings.csv", TEST_ACTOR);
    if (!open.ok) throw new Error(open.message);
    expect(open.body.split("\r\n")).toEqual(expect.arrayContaining(["status,open", "decision,not signed off", "decision_comment,", "signed_by,", "signed_at_utc,"]));
  });

  it("searchTraces pages and searches, and counts each trace's reviews", async () => {
    const { searchTraces } = await import("@/lib/db/traces");
    const all = await searchTraces({ pageSize: 1 });
    expect([all.total, all.pages, all.rows.length]).toEqual([2, 2, 1]);
    const hit = await searchTraces({ q: "route SEVEN" });
    expect(hit.rows.map((t) => [t.id, t.reviewCount])).toEqual([[ids.traceId, 2]]);
    expect((await searchTraces({ q: "probe-test.csv" })).rows.map((t) => t.id)).toEqual([ids.otherTraceId]);
    expect(await searchTraces({ q: "zzz" })).toMatchObject({ total: 0, rows: [] });
    // LIKE wildcards typed into the box are text, not patterns
    expect((await searchTraces({ q: "%" })).total).toBe(0);
    expect((await searchTraces({ q: "_" })).total).toBe(0);
  });

  it("searchReviews searches titles and reviewers; reviewAttention counts in the database", async () => {
    const { searchReviews, reviewAttention } = await import("@/lib/db/reviews");
    expect((await searchReviews({ q: "vintner" })).rows.map((r) => r.id)).toEqual([ids.signedId]);
    expect((await searchReviews({ q: "open one" })).rows.map((r) => r.id)).toEqual([ids.reviewId]);
    // by the trace's name: both reviews of that trace
    expect((await searchReviews({ q: "seven tote" })).total).toBe(2);
    expect((await searchReviews({ q: "%" })).total).toBe(0);
    const att = await reviewAttention();
    // the signed review's decision differs from its suggestion by construction
    expect(att.overriddenCount).toBe(1);
    const { listReviews } = await import("@/lib/db/reviews");
    const all = await listReviews();
    expect(att.openAttentionCount + att.openAcceptCount).toBe(all.filter((r) => r.status === "open").length);
  });

  it("unreviewedTraces lists uploaded traces that no review has used", async () => {
    const { unreviewedTraces } = await import("@/lib/db/traces");
    const { importCsv } = await import("@/lib/trace");
    const dbm = await import("@/lib/db");
    const bytes = readFileSync(path.join(DEMO, "route7-tote3-0609.csv"));
    const id = await dbm.createTrace({ name: "Never looked at", fileName: "route7-tote3-0609.csv", bytes, imported: importCsv(bytes), actor: TEST_ACTOR });
    expect(await unreviewedTraces()).toMatchObject({ total: 1, rows: [{ id, name: "Never looked at" }] });
  });
});
