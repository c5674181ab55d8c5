// Sustained writes through the HTTP API on each database (`npm run bench`, needs a build): uploads of a
// 10,000-row trace and review runs, each by 8 concurrent clients for a fixed time, on SQLite and, when
// CORELAG_BENCH_PG_URL or CORELAG_TEST_PG_URL names a PostgreSQL server, on PostgreSQL. Each database runs in
// its own process (the storage client is chosen once per process). Bounded, local only; not a test.
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { performance } from "node:perf_hooks";
import { randomBytes } from "node:crypto";
import { TEST_ACTOR, seedAccounts, signedInFetch } from "../tests/helpers/accounts";

/** Every request as the signed-in test reviewer (issue 13: pages and routes need a session). */
const fetch = signedInFetch("reviewer");

const CLIENTS = 8;
const PHASE_S = 20;
const ROWS = 10_000;

const percentile = (xs: number[], p: number) => (xs.length ? [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor((p / 100) * xs.length))]! : NaN);

/** Runs one database's bench in a child process per database and prints its lines. */
export function benchDatabases(): void {
  const server = process.env.CORELAG_BENCH_PG_URL || process.env.CORELAG_TEST_PG_URL;
  const targets: Array<{ label: string; url: string | null }> = [{ label: "sqlite", url: null }];
  if (server) {
    const u = new URL(server);
    u.pathname = `/corelag_bench_${randomBytes(4).toString("hex")}`;
    targets.push({ label: "postgres", url: u.toString() });
  } else console.log("databases: PostgreSQL skipped (set CORELAG_BENCH_PG_URL or CORELAG_TEST_PG_URL to a server, e.g. postgresql://postgres@127.0.0.1:5433/postgres)");
  for (const t of targets) {
    const r = spawnSync(process.execPath, [path.join("node_modules", "tsx", "dist", "cli.mjs"), path.join("bench", "databases.ts"), "--one", t.label, ...(t.url ? [t.url] : [])], { stdio: "inherit", env: process.env });
    if (r.status !== 0) process.exitCode = 1;
  }
}

function traceCsv(seed: number): Uint8Array {
  const start = Date.UTC(2026, 5, 1) + seed * 60_000;
  const lines = ["time,air_C"];
  for (let i = 0; i < ROWS; i++) lines.push(`${new Date(start + i * 60_000).toISOString()},${(4 + 3 * Math.sin((2 * Math.PI * i) / 1440)).toFixed(2)}`);
  return new TextEncoder().encode(lines.join("\n") + "\n");
}

/** CLIENTS loops, each doing `op` back to back for PHASE_S seconds; latencies of the completed ones. */
async function sustained(op: (client: number, n: number) => Promise<boolean>): Promise<{ done: number; failed: number; seconds: number; latencies: number[] }> {
  const latencies: number[] = [];
  let failed = 0;
  const t0 = performance.now();
  await Promise.all(
    Array.from({ length: CLIENTS }, async (_, c) => {
      for (let n = 0; performance.now() - t0 < PHASE_S * 1000; n++) {
        const a = performance.now();
        if (await op(c, n)) latencies.push(performance.now() - a);
        else failed++;
      }
    }),
  );
  return { done: latencies.length, failed, seconds: (performance.now() - t0) / 1000, latencies };
}

async function one(label: string, pgUrl: string | undefined): Promise<void> {
  const dir = mkdtempSync(path.join(tmpdir(), "corelag-bench-db-"));
  const url = pgUrl ?? `file:${path.join(dir, "bench.db")}`;
  process.env.DATABASE_URL = url;
  process.env.CORELAG_SIGNING_KEY_FILE = path.join(dir, "bench.key");
  const { migrateDatabase } = await import("../lib/db/migrate");
  migrateDatabase(url);
  seedAccounts(url);
  const { createDefinition } = await import("../lib/db/definitions");
  const productId = (await createDefinition("product", { name: "tray", mass_kg: 0.45, properties: { cp_J_kgK: 3600 }, area_m2: 0.062, h_W_m2K: 2.5, initial_C: 3 }, TEST_ACTOR)).id;
  const limitsId = (await createDefinition("limits", { name: "chilled", sensor_accuracy_K: 0.5, rules: [{ id: "core-above-5C", channel: "core", above_C: 5, max_cumulative_min: 120 }] }, TEST_ACTOR)).id;
  const { startServer } = await import("../tests/helpers/server");
  const server = await startServer({ DATABASE_URL: url, CORELAG_SIGNING_KEY_FILE: process.env.CORELAG_SIGNING_KEY_FILE });
  const csv = traceCsv(0);
  const traceIds: string[] = [];
  try {
    const uploads = await sustained(async (c, n) => {
      const form = new FormData();
      form.set("file", new File([csv as Uint8Array<ArrayBuffer>], `bench-${c}-${n}.csv`, { type: "text/csv" }));
      form.set("name", `bench ${c}/${n}`);
      form.set("options", "{}");
      const r = await fetch(`${server.url}/api/traces`, { method: "POST", body: form });
      const body = (await r.json()) as { id?: string };
      if (r.status === 201 && body.id) traceIds.push(body.id);
      return r.status === 201;
    });
    console.log(
      `databases: ${label}: uploads of a ${ROWS.toLocaleString("en")}-row trace (${(csv.length / 1000).toFixed(0)} kB), ${CLIENTS} clients for ${uploads.seconds.toFixed(0)} s: ` +
        `${(uploads.done / uploads.seconds).toFixed(1)}/s, p50 ${percentile(uploads.latencies, 50).toFixed(0)} ms, p95 ${percentile(uploads.latencies, 95).toFixed(0)} ms, ${uploads.failed} failed`,
    );
    const runs = await sustained(async (c, n) => {
      const res = await fetch(`${server.url}/api/runs`, {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ title: `bench run ${c}/${n}`, traceId: traceIds[(c * 7 + n) % traceIds.length], productId, limitsId, model: "lumped" }),
      });
      if (res.status !== 202) return false;
      const run = (await res.json()) as { id: string };
      for (;;) {
        await new Promise((r) => setTimeout(r, 25));
        const s = (await (await fetch(`${server.url}/api/runs/${run.id}`)).json()) as { status: string };
        if (s.status !== "running") return s.status === "done";
      }
    });
    console.log(
      `databases: ${label}: review runs (lumped, ${ROWS.toLocaleString("en")} readings, request to stored), ${CLIENTS} clients for ${runs.seconds.toFixed(0)} s: ` +
        `${(runs.done / runs.seconds).toFixed(1)}/s, p50 ${percentile(runs.latencies, 50).toFixed(0)} ms, p95 ${percentile(runs.latencies, 95).toFixed(0)} ms, ${runs.failed} failed`,
    );
    const { verifyRecords } = await import("../lib/services/verify");
    const v = await verifyRecords({ reproduce: false });
    console.log(`databases: ${label}: afterwards the chain holds ${v.head?.seq ?? 0} entries and verifies: ${v.ok ? "yes" : `NO (${v.findings.length} findings)`}`);
    if (!v.ok) process.exitCode = 1;
  } finally {
    await server.stop();
    const { db } = await import("../lib/db/client");
    await db.$disconnect();
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[2] === "--one") {
  one(process.argv[3]!, process.argv[4]).catch((e: unknown) => {
    console.error(`databases benchmark (${process.argv[3]}) failed: ${e instanceof Error ? e.message : String(e)}`);
    process.exit(1);
  });
}
