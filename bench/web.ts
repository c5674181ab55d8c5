// Web figures (`npm run bench`, needs a build): the latency of the review list while a long Monte Carlo
// review runs in the worker pool, and the size of a 30-day, 1-minute review page. Bounded, local only.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { performance } from "node:perf_hooks";
import { startServer } from "../tests/helpers/server";
import { seedAccounts, signInCookie, TEST_ACTOR } from "../tests/helpers/accounts";

const percentile = (xs: number[], p: number) => [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor((p / 100) * xs.length))]!;

export async function benchWeb(): Promise<void> {
  const dir = mkdtempSync(path.join(tmpdir(), "corelag-bench-web-"));
  const url = `file:${path.join(dir, "web.db")}`;
  process.env.DATABASE_URL = url;
  const { migrateDatabase } = await import("../lib/db/migrate");
  migrateDatabase(url);
  const { createTrace } = await import("../lib/db/traces");
  const { createDefinition } = await import("../lib/db/definitions");
  const { importCsv } = await import("../lib/trace");
  const { runAndStoreReview } = await import("../lib/services/reviews");
  let csv = "time,air_C\n";
  const start = Date.UTC(2026, 5, 1);
  for (let i = 0; i < 43_200; i++) csv += `${new Date(start + i * 60_000).toISOString()},${(4 + 3 * Math.sin((2 * Math.PI * i) / 1440) + (i % 997 === 0 ? 9 : 0)).toFixed(2)}\n`;
  const bytes = new TextEncoder().encode(csv);
  const traceId = await createTrace({ name: "thirty days", fileName: "thirty-days.csv", bytes, imported: importCsv(bytes), actor: TEST_ACTOR });
  const productId = (await createDefinition("product", { name: "tray", mass_kg: 0.45, properties: { cp_J_kgK: 3600 }, area_m2: 0.062, h_W_m2K: 2.5, initial_C: 3 }, TEST_ACTOR)).id;
  const limitsId = (await createDefinition("limits", { name: "chilled", sensor_accuracy_K: 0.5, rules: [{ id: "core-above-5C", channel: "core", above_C: 5, max_cumulative_min: 120 }, { id: "air-above-8C", channel: "air", above_C: 8, max_continuous_min: 60 }] }, TEST_ACTOR)).id;
  const stored = await runAndStoreReview({ title: "thirty days", traceId, productId, limitsId, model: "lumped" }, TEST_ACTOR);
  if (!stored.ok) throw new Error(stored.message);
  seedAccounts(url);
  const server = await startServer({ DATABASE_URL: url });
  try {
    // every page and route needs a session (issue 13): the bench reads as the reviewer
    const cookie = await signInCookie(server.url, "reviewer");
    const fetch = (u: string, init: RequestInit = {}) => globalThis.fetch(u, { ...init, headers: { ...(init.headers as Record<string, string>), cookie, origin: server.url } });
    const page = await (await fetch(`${server.url}/reviews/${stored.reviewId}`)).text();
    console.log(`web: a 30-day, 1-minute review page is ${(page.length / 1000).toFixed(0)} kB of HTML in all (series data target < 200 kB)`);
    const res = await fetch(server.url + "/api/runs", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ title: "long", traceId, productId, limitsId, model: "lumped", uncertainty: { inputs: [{ path: "product.mass_kg", plusminus: 10, percent: true }], samples: 2_000, seed: 1 } }),
    });
    const run = (await res.json()) as { id: string };
    const latencies: number[] = [];
    let status = "running";
    const t0 = performance.now();
    // One client, one request at a time, for at most 60 s or until the run ends.
    while (status === "running" && performance.now() - t0 < 60_000) {
      const a = performance.now();
      await (await fetch(server.url + "/reviews")).text();
      latencies.push(performance.now() - a);
      status = ((await (await fetch(`${server.url}/api/runs/${run.id}`)).json()) as { status: string }).status;
    }
    const runSeconds = (performance.now() - t0) / 1000;
    console.log(
      `web: during a ${runSeconds.toFixed(0)} s Monte Carlo review (2,000 samples × 43,200 readings) the review list answered ${latencies.length} requests, ` +
        `p50 ${percentile(latencies, 50).toFixed(0)} ms, p95 ${percentile(latencies, 95).toFixed(0)} ms (target < 300 ms); run ${status}`,
    );
  } finally {
    await server.stop();
    const { db } = await import("../lib/db/client");
    await db.$disconnect();
    rmSync(dir, { recursive: true, force: true });
  }
}
