import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startServer, type RunningServer } from "../helpers/server";
import { testDatabaseKind, testDatabaseUrl } from "../helpers/database";
import { seedAccounts, signedInFetch, TEST_ACTOR } from "../helpers/accounts";
import { loggerCsv, START_ISO } from "../fixtures/shipment";

/** Every request as the signed-in test reviewer (issue 13: pages and routes need a session). */
const fetch = signedInFetch("reviewer");

// On PostgreSQL, review runs and shipment review runs go through the job queue in the database (pg-boss): any
// instance can report a run another instance accepted, and a run whose instance was killed is taken up again by
// another one and stored exactly once (issue 14). On SQLite runs stay in the server's own pool (tests/integration/runs.test.ts).
const dir = mkdtempSync(path.join(tmpdir(), "corelag-jobs-"));
const url = testDatabaseUrl(dir, "jobs.db");
process.env.DATABASE_URL = url;
const kind = testDatabaseKind();
/** a started job counts as abandoned after 10 s here (default 600 s), so the test need not wait long */
const env = { DATABASE_URL: url, CORELAG_JOB_EXPIRE_S: "10" };
const ids = { traceId: "", productId: "", limitsId: "" };
const servers: RunningServer[] = [];

beforeAll(async () => {
  if (kind !== "postgres") return;
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  seedAccounts(url);
  const { createTrace } = await import("@/lib/db/traces");
  const { createDefinition } = await import("@/lib/db/definitions");
  const { importCsv } = await import("@/lib/trace");
  // 20 days at one minute (28,800 readings): an invented chilled route with a daily swing
  let csv = "time,air_C\n";
  const start = Date.UTC(2026, 5, 1);
  for (let i = 0; i < 28_800; i++) csv += `${new Date(start + i * 60_000).toISOString()},${(4 + 3 * Math.sin((2 * Math.PI * i) / 1440)).toFixed(2)}\n`;
  const bytes = new TextEncoder().encode(csv);
  ids.traceId = await createTrace({ name: "twenty days", fileName: "twenty-days.csv", bytes, imported: importCsv(bytes), actor: TEST_ACTOR });
  ids.productId = (await createDefinition("product", { name: "tray", mass_kg: 0.45, properties: { cp_J_kgK: 3600 }, area_m2: 0.062, h_W_m2K: 2.5, initial_C: 3 }, TEST_ACTOR)).id;
  ids.limitsId = (await createDefinition("limits", { name: "chilled", sensor_accuracy_K: 0.5, rules: [{ id: "core-above-5C", channel: "core", above_C: 5, max_cumulative_min: 120 }] }, TEST_ACTOR)).id;
}, 180_000);

afterAll(async () => {
  for (const s of servers) await s.stop();
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

type Run = { id: string; status: string; reviewId?: string; message?: string };
const state = async (base: string, id: string): Promise<Run> => (await fetch(`${base}/api/runs/${id}`)).json() as Promise<Run>;
async function until(base: string, id: string, done: (r: Run) => boolean, seconds: number): Promise<Run> {
  let r = await state(base, id);
  for (let i = 0; i < seconds * 4 && !done(r); i++) {
    await new Promise((res) => setTimeout(res, 250));
    r = await state(base, id);
  }
  return r;
}

describe.runIf(kind === "postgres")("review runs through the job queue (PostgreSQL)", () => {
  it("a run accepted by one instance is reported by another, and stored under its job's id", async () => {
    const a = await startServer(env);
    const b = await startServer(env);
    servers.push(a, b);
    const res = await fetch(`${a.url}/api/runs`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ title: "queued quick", ...ids, model: "lumped" }) });
    expect(res.status).toBe(202);
    const run = (await res.json()) as Run;
    const seen = await until(b.url, run.id, (r) => r.status !== "running", 60);
    expect(seen).toMatchObject({ status: "done", reviewId: run.id.replace(/-/g, "") });
    const { db } = await import("@/lib/db/client");
    expect(await db.review.count({ where: { title: "queued quick" } })).toBe(1);
    await a.stop();
    await b.stop();
    servers.length = 0;
  }, 240_000);

  it("a run whose instance is killed mid-computation is taken up by another instance and stored exactly once", async () => {
    const a = await startServer(env);
    servers.push(a);
    const res = await fetch(`${a.url}/api/runs`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ title: "survives a restart", ...ids, model: "lumped", uncertainty: { inputs: [{ path: "product.mass_kg", plusminus: 10, percent: true, distribution: "normal" }], samples: 2_000, seed: 1 } }),
    });
    expect(res.status).toBe(202);
    const run = (await res.json()) as Run;
    // wait until instance A has started it (progress reported), then kill A
    await until(a.url, run.id, (r) => (r as Run & { progress: number }).progress > 0 || r.status !== "running", 60);
    expect((await state(a.url, run.id)).status).toBe("running");
    await a.kill();
    servers.length = 0;
    const b = await startServer(env);
    servers.push(b);
    expect((await state(b.url, run.id)).status).toBe("running"); // still owed, not lost
    const done = await until(b.url, run.id, (r) => r.status !== "running", 180);
    expect(done).toMatchObject({ status: "done", reviewId: run.id.replace(/-/g, "") });
    const { db } = await import("@/lib/db/client");
    expect(await db.review.count({ where: { title: "survives a restart" } })).toBe(1);
    const { verifyRecords } = await import("@/lib/services/verify");
    const report = await verifyRecords({ reproduce: false });
    expect(report.findings).toEqual([]);
    const runs = await db.auditEntry.count({ where: { action: "run" } });
    expect(runs).toBe(2); // one per stored review, none for the killed attempt
  }, 400_000);

  it("a queued run cancelled from any instance stores nothing and is audited", async () => {
    const b = servers[0]!;
    const res = await fetch(`${b.url}/api/runs`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ title: "to cancel", ...ids, model: "lumped", uncertainty: { inputs: [{ path: "product.mass_kg", plusminus: 10, percent: true, distribution: "normal" }], samples: 2_000, seed: 2 } }),
    });
    const run = (await res.json()) as Run;
    await until(b.url, run.id, (r) => (r as Run & { progress: number }).progress > 0, 60);
    const c = await fetch(`${b.url}/api/runs/${run.id}/cancel`, { method: "POST" });
    expect(c.status).toBeLessThan(300);
    const after = await until(b.url, run.id, (r) => r.status !== "running", 30);
    expect(after.status).toBe("cancelled");
    const { db } = await import("@/lib/db/client");
    expect(await db.review.count({ where: { title: "to cancel" } })).toBe(0);
    expect(await db.auditEntry.count({ where: { action: "cancel", entityId: run.id } })).toBe(1);
  }, 200_000);

  it("a shipment review run queued by one process is computed by a server instance and stored once under its job's id", async () => {
    const b = servers[0] ?? (await startServer(env));
    if (!servers.includes(b)) servers.push(b);
    const { createShipmentFromForm } = await import("@/lib/services/shipments");
    const { storeBatch } = await import("@/lib/services/batch");
    const { getShipment } = await import("@/lib/db/shipments");
    const { startShipmentReview } = await import("@/lib/services/shipments");
    const made = await createShipmentFromForm({ reference: "QUEUED-1", limitsId: ids.limitsId, actualDepartureAt: START_ISO }, [
      { position: "front", products: [{ productId: ids.productId }] },
      { position: "rear", products: [{ productId: ids.productId }] },
    ], TEST_ACTOR);
    if (!made.ok) throw new Error(made.message);
    const s = (await getShipment(made.shipmentId))!;
    const stored = await storeBatch(made.shipmentId, [{ name: "f.csv", bytes: new TextEncoder().encode(loggerCsv(1)) }, { name: "r.csv", bytes: new TextEncoder().encode(loggerCsv(2)) }], {
      matches: [{ file: "f.csv", shipmentLoggerId: s.loggers[0]!.id }, { file: "r.csv", shipmentLoggerId: s.loggers[1]!.id }],
      register: [{ serial: "SN-1001", accuracyK: 0.5 }, { serial: "SN-1002", accuracyK: 0.5 }], // invented loggers
    }, TEST_ACTOR);
    expect(stored.ok && stored.result.stored.length).toBe(2);
    // this test process takes no jobs (it never started workers): only the server instance can compute it
    const started = await startShipmentReview(made.shipmentId, TEST_ACTOR);
    if (!started.ok) throw new Error(started.message);
    expect(started.run).toMatchObject({ kind: "shipment", status: "running", total: 2 });
    const done = await until(b.url, started.run.id, (r) => r.status !== "running", 120);
    expect(done).toMatchObject({ status: "done", kind: "shipment", done: 2, total: 2, shipmentId: made.shipmentId });
    const { db } = await import("@/lib/db/client");
    expect(await db.shipmentReview.count({ where: { shipmentId: made.shipmentId, runId: started.run.id } })).toBe(2);
    expect(await db.auditEntry.count({ where: { action: "run", entity: "shipment", entityId: made.shipmentId } })).toBe(1);
  }, 200_000);
});
