import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startServer, type RunningServer } from "../helpers/server";
import { testDatabaseKind, testDatabaseUrl } from "../helpers/database";
import { TEST_ACTOR, seedAccounts, signedInFetch } from "../helpers/accounts";

/** Every request as the signed-in test reviewer (issue 13: pages and routes need a session). */
const fetch = signedInFetch("reviewer");

// SIGKILL of the server in the middle of a large upload and of a review run (issue 14), on SQLite and (npm run
// test:pg) PostgreSQL: after a restart there is no partial trace, review or audit entry (every row has its
// entry and every entry its row: verify), SQLite's integrity check is ok, and the app works again.
const dir = mkdtempSync(path.join(tmpdir(), "corelag-crash-"));
const url = testDatabaseUrl(dir, "crash.db");
process.env.DATABASE_URL = url;
const kind = testDatabaseKind();

// 200,000 one-minute readings (about 6 MB): an invented trace whose import and storage take a while.
const bigCsv = (() => {
  const start = Date.UTC(2026, 0, 1);
  const lines = ["time,air_C"];
  for (let i = 0; i < 200_000; i++) lines.push(`${new Date(start + i * 60_000).toISOString()},${(4 + 3 * Math.sin((2 * Math.PI * i) / 1440)).toFixed(2)}`);
  return new TextEncoder().encode(lines.join("\n") + "\n");
})();
const ids = { traceId: "", productId: "", limitsId: "" };

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  seedAccounts(url);
  const { createTrace } = await import("@/lib/db/traces");
  const { createDefinition } = await import("@/lib/db/definitions");
  const { importCsv } = await import("@/lib/trace");
  const small = bigCsv.slice(0, bigCsv.indexOf(10, 600_000) + 1); // the first ~20,000 readings
  ids.traceId = await createTrace({ name: "crash base", fileName: "base.csv", bytes: small, imported: importCsv(small), actor: TEST_ACTOR });
  ids.productId = (await createDefinition("product", { name: "tray", mass_kg: 0.45, properties: { cp_J_kgK: 3600 }, area_m2: 0.062, h_W_m2K: 2.5, initial_C: 3 }, TEST_ACTOR)).id;
  ids.limitsId = (await createDefinition("limits", { name: "chilled", sensor_accuracy_K: 0.5, rules: [{ id: "core-above-5C", channel: "core", above_C: 5, max_cumulative_min: 120 }] }, TEST_ACTOR)).id;
}, 180_000);

afterAll(async () => {
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

async function afterRestartAllIsWhole(): Promise<{ traces: number; reviews: number; entries: number }> {
  const { verifyRecords } = await import("@/lib/services/verify");
  const report = await verifyRecords({ reproduce: false });
  expect(report.findings).toEqual([]);
  const { db } = await import("@/lib/db/client");
  if (kind === "sqlite") expect(await db.$queryRawUnsafe("PRAGMA integrity_check")).toEqual([{ integrity_check: "ok" }]);
  const [traces, reviews, entries] = await Promise.all([db.trace.count(), db.review.count(), db.auditEntry.count({ where: { entity: { not: "user" } } })]);
  // entries of records (the test accounts' sign-ins on each restarted server are not what is counted)
  return { traces, reviews, entries };
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe(`SIGKILL mid-write on ${kind}`, () => {
  it("killed during large uploads at several moments, then restarted: each upload is stored whole or not at all", async () => {
    for (const delay_ms of [300, 1200, 2500]) {
      const server: RunningServer = await startServer({ DATABASE_URL: url });
      const before = await afterRestartAllIsWhole();
      const form = new FormData();
      form.set("file", new File([bigCsv], `big-${delay_ms}.csv`, { type: "text/csv" }));
      form.set("name", `killed at ${delay_ms} ms`);
      form.set("options", "{}");
      const request = fetch(`${server.url}/api/traces`, { method: "POST", body: form }).then(
        (r) => r.status,
        () => "connection lost" as const,
      );
      await sleep(delay_ms);
      await server.kill();
      const answered = await request;
      const after = await afterRestartAllIsWhole();
      const { db } = await import("@/lib/db/client");
      const stored = await db.trace.count({ where: { name: `killed at ${delay_ms} ms` } });
      // whole or nothing: either the trace and its one import entry, or neither (a 201 means it was stored)
      expect(stored === 0 || stored === 1).toBe(true);
      if (answered === 201) expect(stored).toBe(1);
      expect(after.traces - before.traces).toBe(stored);
      expect(after.entries - before.entries).toBe(stored);
    }
    // the app works again on the same database
    const server = await startServer({ DATABASE_URL: url });
    const form = new FormData();
    form.set("file", new File([bigCsv.slice(0, bigCsv.indexOf(10, 200_000) + 1)], "after.csv", { type: "text/csv" }));
    form.set("name", "after the crashes");
    form.set("options", "{}");
    const r = await fetch(`${server.url}/api/traces`, { method: "POST", body: form });
    await server.stop();
    expect(r.status).toBe(201);
    await afterRestartAllIsWhole();
  }, 600_000);

  it("killed during a review run, then restarted: no review and no audit entry of the run", async () => {
    const server = await startServer({ DATABASE_URL: url });
    const before = await afterRestartAllIsWhole();
    const res = await fetch(`${server.url}/api/runs`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ title: "killed run", ...ids, model: "lumped", uncertainty: { inputs: [{ path: "product.mass_kg", plusminus: 10, percent: true, distribution: "normal" }], samples: 20_000, seed: 1 } }),
    });
    expect(res.status).toBe(202);
    // 20,000 samples × ~20,000 readings (4e8 exact lumped steps, under the 5e8 cap) take many seconds even on
    // a quiet machine: the kill lands mid-run, which the run's own status confirms just before it
    const { status_url } = (await res.json()) as { status_url: string };
    await sleep(1500);
    expect(((await (await fetch(`${server.url}${status_url}`)).json()) as { status: string }).status).toBe("running");
    await server.kill();
    const after = await afterRestartAllIsWhole();
    const { db } = await import("@/lib/db/client");
    expect(await db.review.count({ where: { title: "killed run" } })).toBe(0);
    expect(after.reviews).toBe(before.reviews);
    expect(after.entries).toBe(before.entries);
    // and a run after the restart completes and is stored
    const again = await startServer({ DATABASE_URL: url });
    try {
      const r = await fetch(`${again.url}/api/runs`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ title: "after restart", ...ids, model: "lumped" }) });
      const run = (await r.json()) as { id: string; status: string };
      let state: { status: string } = run;
      for (let i = 0; i < 600 && state.status === "running"; i++) {
        await sleep(100);
        state = await (await fetch(`${again.url}/api/runs/${run.id}`)).json();
      }
      expect(state.status).toBe("done");
    } finally {
      await again.stop();
    }
    expect((await afterRestartAllIsWhole()).reviews).toBe(before.reviews + 1);
  }, 300_000);
});
