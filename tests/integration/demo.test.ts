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
  // as npm start: the demo accounts first (the demo monitor's device token belongs to the first administrator)
  const { createDemoAccounts } = await import("@/lib/services/users");
  await createDemoAccounts(TEST_ACTOR);
});

afterAll(async () => {
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

describe("demo loader", () => {
  it("loadDemoIfEmpty loads one signed, historic review and the open ones, and only once", async () => {
    const { loadDemoIfEmpty } = await import("@/lib/services/demo");
    const { listReviews, getReview } = await import("@/lib/db/reviews");
    expect(await loadDemoIfEmpty()).toBe("loaded");
    expect(await loadDemoIfEmpty()).toBe("skipped");
    const reviews = await listReviews();
    // two open: the 16 June review and the demo shipment's review of the same trace (see the shipment test below)
    expect(reviews.map((r) => r.status).sort()).toEqual(["open", "open", "signed"]);
    const signed = (await getReview(reviews.find((r) => r.status === "signed")!.id))!;
    // the 9 June run has door openings only: every rule passes, and the reviewer accepted it
    expect([signed.outcome, signed.decision, signed.signedBy]).toEqual(["accept", "accept", "Mara Quellen (QA, invented)"]);
    expect(signed.signComment).toMatch(/core estimate stayed below 5 °C/);
    expect(signed.trace.startAt.toISOString()).toBe("2026-06-09T03:00:00.000Z");
    expect(reviews.filter((r) => r.status === "open").map((r) => r.title).sort()).toEqual([
      "R7-0616 (invented) · tote 3 of 8 · Ready meal tray 450 g (in tote)",
      "Route 7, 16 June: tote 3 after the dock delay (demo)",
    ]);
  });

  it("the demo holds one shipment on the demo lane, with tote 3's registered logger, the 16 June trace and its shipment review, once", async () => {
    const { loadDemoIfEmpty } = await import("@/lib/services/demo");
    const { listShipments, listLanes, listLoggers, getShipment } = await import("@/lib/db/shipments");
    const { listReviews, getReview } = await import("@/lib/db/reviews");
    expect(await loadDemoIfEmpty()).toBe("skipped"); // loaded by the first test: nothing is added twice
    const shipments = await listShipments();
    expect(shipments.map((s) => [s.reference, s.lane?.name, s._count.loggers, s.status])).toEqual([["R7-0616 (invented)", "Route 7 north (demo)", 1, "open"]]);
    expect((await listLanes()).map((l) => l.name)).toEqual(["Route 7 north (demo)"]);
    expect((await listLoggers()).map((l) => [l.serial, l.accuracyK])).toEqual([["HX-20417", 0.5]]);
    const s = (await getShipment(shipments[0]!.id))!;
    expect(s.loggers[0]!.trace!.name).toBe("Route 7 north, tote 3 (demo)");
    expect(s.reviews).toHaveLength(1);
    // the same trace, product and limit set as the demo's open 16 June review (whose sensor accuracy, 0.5 K, equals
    // the register's), so the shipment suggests what that review suggests: the dock delay keeps the core above 5 °C too long
    const alone = (await listReviews()).find((r) => r.title === "Route 7, 16 June: tote 3 after the dock delay (demo)")!;
    const mine = (await getReview(s.reviews[0]!.reviewId))!;
    expect(mine.outcome).toBe((await getReview(alone.id))!.outcome);
    expect(s.outcome).toBe(mine.outcome);
    expect(s.outcome).toBe("reject");
  });

  it("the demo's signed review reproduces when re-checked, and the probe test shows as never reviewed", async () => {
    const { listReviews } = await import("@/lib/db/reviews");
    const { recheckReview } = await import("@/lib/services/recheck");
    const { unreviewedTraces } = await import("@/lib/db/traces");
    const signed = (await listReviews({ status: "signed" }))[0]!;
    expect(await recheckReview(signed.id, TEST_ACTOR)).toMatchObject({ ok: true, check: { reproduced: true } });
    expect((await unreviewedTraces()).rows.map((t) => t.name)).toEqual(["Probe test, tray with simulant (demo)"]);
  });

  it("the demo monitor's fixed public token (README, corelag simulate) is a device API token of the first administrator, bound to it", async () => {
    const { DEMO_MONITOR } = await import("@/lib/services/demoNames");
    const { listMonitors } = await import("@/lib/db/monitors");
    const { actorFromAuthorization } = await import("@/lib/services/apiTokens");
    const { usesDemoToken, deviceBindingRefusal } = await import("@/lib/services/monitors");
    const demo = (await listMonitors()).find((m) => m.name === DEMO_MONITOR.name)!;
    const r = await actorFromAuthorization(`Bearer ${DEMO_MONITOR.token}`);
    expect(r).toMatchObject({ ok: true, actor: { kind: "token", scope: "device", role: "admin", monitorId: demo.id } });
    if (r.ok) expect(deviceBindingRefusal(r.actor, demo.id)).toBeNull();
    expect(await usesDemoToken(demo.id, DEMO_MONITOR.token)).toBe(true);
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
      // the demo shipment's review (with the logger register's accuracy in its options) reproduces too
      ["R7-0616 (invented) · tote 3 of 8 · Ready meal tray 450 g (in tote)", true],
    ]);
  });
});
