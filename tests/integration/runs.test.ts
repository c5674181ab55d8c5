import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startServer, type RunningServer } from "../helpers/server";
import { testDatabaseKind, testDatabaseUrl } from "../helpers/database";
import { seedAccounts, signInCookie, TEST_ACTOR } from "../helpers/accounts";

// Review runs from the web go to the worker pool: the server keeps answering while one runs, a run can be
// cancelled (nothing stored, an audit entry says so), and a request over the work cap is refused by name.
const dir = mkdtempSync(path.join(tmpdir(), "corelag-runs-"));
const url = testDatabaseUrl(dir, "runs.db");
process.env.DATABASE_URL = url;

let server: RunningServer;
const ids = { traceId: "", productId: "", limitsId: "" };

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  const { createTrace } = await import("@/lib/db/traces");
  const { createDefinition } = await import("@/lib/db/definitions");
  const { importCsv } = await import("@/lib/trace");
  // 30 days at one minute (43,200 readings): an invented chilled route with a daily swing.
  let csv = "time,air_C\n";
  const start = Date.UTC(2026, 5, 1);
  for (let i = 0; i < 43_200; i++) csv += `${new Date(start + i * 60_000).toISOString()},${(4 + 3 * Math.sin((2 * Math.PI * i) / 1440)).toFixed(2)}\n`;
  const bytes = new TextEncoder().encode(csv);
  ids.traceId = await createTrace({ name: "thirty days", fileName: "thirty-days.csv", bytes, imported: importCsv(bytes), actor: TEST_ACTOR });
  ids.productId = (await createDefinition("product", { name: "tray", mass_kg: 0.45, properties: { cp_J_kgK: 3600 }, area_m2: 0.062, h_W_m2K: 2.5, initial_C: 3 }, TEST_ACTOR)).id;
  ids.limitsId = (await createDefinition("limits", { name: "chilled", sensor_accuracy_K: 0.5, rules: [{ id: "core-above-5C", channel: "core", above_C: 5, max_cumulative_min: 120 }] }, TEST_ACTOR)).id;
  seedAccounts(url);
  server = await startServer({ DATABASE_URL: url });
  cookie = await signInCookie(server.url, "reviewer");
});

afterAll(async () => {
  await server?.stop();
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

let cookie = "";
/** GET as the signed-in reviewer. */
const get = (p: string) => fetch(server.url + p, { headers: { cookie } });
const post = (p: string, body?: unknown) => fetch(server.url + p, { method: "POST", headers: { "content-type": "application/json", cookie, origin: server.url }, body: body === undefined ? undefined : JSON.stringify(body) });
const monteCarlo = (samples: number) => ({ inputs: [{ path: "product.mass_kg", plusminus: 10, percent: true, distribution: "normal" }], samples, seed: 1 });

describe("review runs in the worker pool", () => {
  it("a quick run ends done with its review stored", async () => {
    const res = await post("/api/runs", { title: "quick", ...ids, model: "lumped" });
    expect(res.status).toBe(202);
    const run = (await res.json()) as { id: string; status: string };
    let state: { status: string; reviewId?: string } = run;
    for (let i = 0; i < 200 && state.status === "running"; i++) {
      await new Promise((r) => setTimeout(r, 100));
      state = await (await get(`/api/runs/${run.id}`)).json();
    }
    expect(state.status).toBe("done");
    const { getReview } = await import("@/lib/db/reviews");
    expect((await getReview(state.reviewId!))!.title).toBe("quick");
  });

  it("while a long Monte Carlo run works, other requests are answered; cancelled, it stores nothing and is audited", async () => {
    const { db } = await import("@/lib/db/client");
    const reviewsBefore = await db.review.count();
    const res = await post("/api/runs", { title: "long", ...ids, model: "lumped", uncertainty: monteCarlo(10_000) });
    expect(res.status).toBe(202);
    const { id } = (await res.json()) as { id: string };
    // Pages are served meanwhile, and the run is still going after they came back.
    for (let i = 0; i < 3; i++) expect((await get("/traces")).status).toBe(200);
    const during = await (await get(`/api/runs/${id}`)).json();
    expect(during.status).toBe("running");
    const cancelled = await post(`/api/runs/${id}/cancel`);
    expect(cancelled.status).toBe(200);
    expect((await cancelled.json()).status).toBe("cancelled");
    expect(await db.review.count()).toBe(reviewsBefore);
    const entries = await db.auditEntry.findMany({ where: { entityId: id } });
    expect(entries.map((e) => [e.action, e.entity])).toEqual([["cancel", "run"]]);
    expect((await post(`/api/runs/${id}/cancel`)).status).toBe(409);
  });

  it("a run over the server's work cap is refused with the cap and the command line to use instead", async () => {
    // 43,200 samples × (1 + 20,000) ≈ 8.6e8 steps > the 5e8 cap (lib/services/runs.ts).
    const res = await post("/api/runs", { title: "huge", ...ids, model: "lumped", uncertainty: monteCarlo(20_000) });
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.field).toBe("uncertainty");
    expect(body.error).toContain("the server runs at most 5e+8 per request");
    expect(body.error).toContain("npm run -s corelag -- review");
  });

  it("SIGTERM during a long run stops the server within seconds, stores nothing and leaves the database intact", async () => {
    // 10,000 samples × 43,200 readings (4.3e8 exact lumped steps, under the 5e8 cap) run for many seconds even
    // on a quiet machine, so the signal always lands mid-run (2,000 samples could finish before it)
    const { db } = await import("@/lib/db/client");
    const reviewsBefore = await db.review.count();
    const other = await startServer({ DATABASE_URL: url });
    const res = await fetch(other.url + "/api/runs", { method: "POST", headers: { "content-type": "application/json", cookie: await signInCookie(other.url, "reviewer"), origin: other.url }, body: JSON.stringify({ title: "interrupted", ...ids, model: "lumped", uncertainty: monteCarlo(10_000) }) });
    expect(res.status).toBe(202);
    const t0 = Date.now();
    await other.stop();
    // The request thread is free (the engine is in a worker), so the signal is handled at once; 10 s is slack for a busy machine.
    expect(Date.now() - t0).toBeLessThan(10_000);
    expect(await db.review.count()).toBe(reviewsBefore);
    if (testDatabaseKind() === "sqlite") expect(await db.$queryRawUnsafe("PRAGMA integrity_check")).toEqual([{ integrity_check: "ok" }]);
  });

  it("an unknown run is a 404", async () => {
    expect((await get(`/api/runs/not-a-run`)).status).toBe(404);
  });
});
