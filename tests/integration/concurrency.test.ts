import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startServer, type RunningServer } from "../helpers/server";
import { testDatabaseKind, testDatabaseUrl } from "../helpers/database";
import { TEST_ACTOR, seedAccounts, signedInFetch } from "../helpers/accounts";

/** Every request as the signed-in test reviewer (issue 13: pages and routes need a session). */
const fetch = signedInFetch("reviewer");

// Many writers at once through the HTTP API (issue 14), on SQLite and (npm run test:pg) on PostgreSQL:
// 20 uploads and 50 review runs in parallel, then every one stored exactly once, the audit chain one
// gap-free signed chain, the counts matching, and no 5xx. On PostgreSQL also two `next start` instances
// on one database, writing at once. Local only; the concurrency is bounded by the number of requests.
const dir = mkdtempSync(path.join(tmpdir(), "corelag-conc-"));
const url = testDatabaseUrl(dir, "conc.db");
process.env.DATABASE_URL = url;
const kind = testDatabaseKind();
const DEMO = path.join(__dirname, "../../public/demo");
const routeBytes = readFileSync(path.join(DEMO, "route7-tote3.csv"));

let server: RunningServer;
const ids = { traceId: "", productId: "", limitsId: "" };

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  seedAccounts(url);
  const { createDefinition } = await import("@/lib/db/definitions");
  ids.productId = (await createDefinition("product", JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8")), TEST_ACTOR)).id;
  ids.limitsId = (await createDefinition("limits", JSON.parse(readFileSync(path.join(DEMO, "ready-meal.limits.json"), "utf8")), TEST_ACTOR)).id;
  server = await startServer({ DATABASE_URL: url });
}, 180_000);

afterAll(async () => {
  await server?.stop();
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

function upload(base: string, name: string): Promise<Response> {
  const form = new FormData();
  form.set("file", new File([routeBytes], "route7-tote3.csv", { type: "text/csv" }));
  form.set("name", name);
  form.set("options", "{}");
  return fetch(`${base}/api/traces`, { method: "POST", body: form });
}

async function runReview(base: string, title: string, traceId: string): Promise<{ status: number; final: { status: string; reviewId?: string; message?: string } | null }> {
  const res = await fetch(`${base}/api/runs`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ title, traceId, productId: ids.productId, limitsId: ids.limitsId, model: "lumped" }) });
  if (res.status !== 202) return { status: res.status, final: null };
  const run = (await res.json()) as { id: string; status: string };
  let state: { status: string; reviewId?: string; message?: string } = run;
  for (let i = 0; i < 1200 && state.status === "running"; i++) {
    await new Promise((r) => setTimeout(r, 100));
    const s = await fetch(`${base}/api/runs/${run.id}`);
    if (s.status >= 500) return { status: s.status, final: null };
    state = await s.json();
  }
  return { status: res.status, final: state };
}

async function chainReport() {
  const { verifyRecords } = await import("@/lib/services/verify");
  return verifyRecords({ reproduce: false });
}

describe(`concurrent writers on ${kind}`, () => {
  it("20 uploads and 50 review runs at once: each stored exactly once, one unbroken signed chain, no 5xx", async () => {
    const uploads = await Promise.all(Array.from({ length: 20 }, (_, i) => upload(server.url, `parallel upload ${i}`)));
    const bodies = await Promise.all(uploads.map(async (r) => ({ status: r.status, body: (await r.json()) as { id?: string; error?: string } })));
    expect(bodies.filter((b) => b.status !== 201)).toEqual([]);
    const traceIds = bodies.map((b) => b.body.id!);
    expect(new Set(traceIds).size).toBe(20);

    const runs = await Promise.all(Array.from({ length: 50 }, (_, i) => runReview(server.url, `parallel run ${i}`, traceIds[i % 20]!)));
    expect(runs.filter((r) => r.status !== 202 || r.final?.status !== "done")).toEqual([]);

    const { db } = await import("@/lib/db/client");
    const traces = await db.trace.findMany({ select: { name: true } });
    const reviews = await db.review.findMany({ select: { title: true } });
    // exactly once each: the names are all there and none twice
    expect(traces.map((t) => t.name).sort()).toEqual(Array.from({ length: 20 }, (_, i) => `parallel upload ${i}`).sort());
    expect(reviews.map((r) => r.title).sort()).toEqual(Array.from({ length: 50 }, (_, i) => `parallel run ${i}`).sort());
    // the chain: the key, 2 definitions, 20 imports, 50 runs (counted from the writes above), and the test
    // accounts' entries (4 created, 1 sign-in), numbered without a gap
    const entries = await db.auditEntry.findMany({ select: { seq: true, action: true, entity: true }, orderBy: { seq: "asc" } });
    expect(entries.filter((e) => e.entity === "user")).toHaveLength(5);
    expect(entries.map((e) => e.seq)).toEqual(Array.from({ length: 78 }, (_, i) => i + 1));
    expect(entries.filter((e) => e.action === "import")).toHaveLength(20);
    expect(entries.filter((e) => e.action === "run")).toHaveLength(50);
    const report = await chainReport();
    expect(report.findings).toEqual([]);
    expect(report.head?.seq).toBe(78);
    expect(server.output()).not.toMatch(/SQLITE_BUSY|Unique constraint|unique constraint/);
  }, 600_000);

  it.runIf(kind === "postgres")("two app instances on one PostgreSQL database write at once; each sees the other's records and the chain verifies", async () => {
    const second = await startServer({ DATABASE_URL: url });
    try {
      const { db } = await import("@/lib/db/client");
      const before = await db.auditEntry.count();
      const both = [server.url, second.url];
      const uploads = await Promise.all(Array.from({ length: 12 }, (_, i) => upload(both[i % 2]!, `instance ${i % 2} upload ${i}`)));
      const created = await Promise.all(uploads.map(async (r) => ({ status: r.status, id: ((await r.json()) as { id?: string }).id })));
      expect(created.map((c) => c.status)).toEqual(Array(12).fill(201));
      const runs = await Promise.all(Array.from({ length: 12 }, (_, i) => runReview(both[i % 2]!, `instance ${i % 2} run ${i}`, created[(i + 1) % 12]!.id!)));
      expect(runs.map((r) => r.final?.status)).toEqual(Array(12).fill("done"));
      // each instance serves the records the other wrote
      for (let i = 0; i < 12; i++) {
        const other = both[(i + 1) % 2]!;
        const page = await fetch(`${other}/traces/${created[i]!.id}`);
        expect(page.status).toBe(200);
        expect(await page.text()).toContain(`instance ${i % 2} upload ${i}`);
        const review = await fetch(`${other}/reviews/${runs[i]!.final!.reviewId}`);
        expect(review.status).toBe(200);
      }
      expect(await db.auditEntry.count()).toBe(before + 24 + 1); // 12 imports, 12 runs, and the test reviewer signing in on the second instance
      const report = await chainReport();
      expect(report.findings).toEqual([]);
      expect(report.head?.seq).toBe(before + 25);
    } finally {
      await second.stop();
    }
  }, 600_000);
});
