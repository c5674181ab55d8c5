import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { spawnSync } from "node:child_process";
import { testDatabaseUrl } from "../helpers/database";
import { TEST_ACTOR } from "../helpers/accounts";

// The demo scenario loaded into a fresh SQLite file, as `npm start` does on first run.
const dir = mkdtempSync(path.join(tmpdir(), "corelag-demo-"));
const url = testDatabaseUrl(dir, "demo.db");
process.env.DATABASE_URL = url;

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
});

afterAll(async () => {
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

describe("demo loader", () => {
  it("loadDemoIfEmpty loads one signed, historic review and one open review, and only once", async () => {
    const { loadDemoIfEmpty } = await import("@/lib/services/demo");
    const { listReviews, getReview } = await import("@/lib/db/reviews");
    expect(await loadDemoIfEmpty()).toBe("loaded");
    expect(await loadDemoIfEmpty()).toBe("skipped");
    const reviews = await listReviews();
    expect(reviews.map((r) => r.status).sort()).toEqual(["open", "signed"]);
    const signed = (await getReview(reviews.find((r) => r.status === "signed")!.id))!;
    // the 9 June run has door openings only: every rule passes, and the reviewer accepted it
    expect([signed.outcome, signed.decision, signed.signedBy]).toEqual(["accept", "accept", "Mara Quellen (QA, invented)"]);
    expect(signed.signComment).toMatch(/core estimate stayed below 5 °C/);
    expect(signed.trace.startAt.toISOString()).toBe("2026-06-09T03:00:00.000Z");
    const open = reviews.find((r) => r.status === "open")!;
    expect(open.title).toBe("Route 7, 16 June: tote 3 after the dock delay (demo)");
  });

  it("the demo's signed review reproduces when re-checked, and the probe test shows as never reviewed", async () => {
    const { listReviews } = await import("@/lib/db/reviews");
    const { recheckReview } = await import("@/lib/services/recheck");
    const { unreviewedTraces } = await import("@/lib/db/traces");
    const signed = (await listReviews({ status: "signed" }))[0]!;
    expect(await recheckReview(signed.id, TEST_ACTOR)).toMatchObject({ ok: true, check: { reproduced: true } });
    expect((await unreviewedTraces()).rows.map((t) => t.name)).toEqual(["Probe test, tray with simulant (demo)"]);
  });

  it("demo:reset refuses without --yes, and with it starts the database over with only the demo", async () => {
    const other = `file:${path.join(dir, "reset.db")}`;
    const ROOT = path.resolve(__dirname, "../..");
    const run = (...args: string[]) =>
      spawnSync(process.execPath, [path.join(ROOT, "node_modules/tsx/dist/cli.mjs"), path.join(ROOT, "scripts/reset-demo.ts"), ...args], { cwd: ROOT, encoding: "utf8", env: { ...process.env, DATABASE_URL: other } });
    const refused = run();
    expect(refused.status).toBe(2);
    expect(refused.stderr).toContain("Run it again with --yes");
    expect(run("--yes").status).toBe(0);
    expect(run("--yes").status).toBe(0); // twice: the second deletes the first's records and loads the demo again
    // the new database holds the demo's two reviews, and both reproduce (corelag verify)
    const verify = spawnSync(process.execPath, [path.join(ROOT, "node_modules/tsx/dist/cli.mjs"), path.join(ROOT, "lib/cli/main.ts"), "verify"], { cwd: ROOT, encoding: "utf8", env: { ...process.env, DATABASE_URL: other } });
    expect(verify.status).toBe(0);
    const out = JSON.parse(verify.stdout) as { chain: { entries: number }; reviews: Array<{ title: string; reproduced: boolean }> };
    expect(out.reviews.map((r) => [r.title, r.reproduced])).toEqual([
      ["Route 7, 9 June: tote 3, door openings only (demo)", true],
      ["Route 7, 16 June: tote 3 after the dock delay (demo)", true],
    ]);
  });
});
