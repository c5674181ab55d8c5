import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { testDatabaseUrl } from "../helpers/database";
import { TEST_ACTOR } from "../helpers/accounts";

// The server's calibration fit runs in the engine's worker pool and gives exactly the in-process fit.
const dir = mkdtempSync(path.join(tmpdir(), "corelag-calpool-"));
const url = testDatabaseUrl(dir, "cal.db");
process.env.DATABASE_URL = url;
const DEMO = path.join(__dirname, "../../public/demo");

afterAll(async () => {
  const { closeEnginePool } = await import("@/lib/services/enginePool");
  await closeEnginePool();
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

describe("runCalibration in the worker pool", () => {
  it("fits the demo probe test (simulant made with tau = 2.5 h) exactly as calibrateLumped does in this thread", async () => {
    const { migrateDatabase } = await import("@/lib/db/migrate");
    migrateDatabase(url);
    const { importCsv, bridgeGaps } = await import("@/lib/trace");
    const { createTrace } = await import("@/lib/db/traces");
    const { createDefinition } = await import("@/lib/db/definitions");
    const bytes = readFileSync(path.join(DEMO, "probe-test.csv"));
    const imported = importCsv(bytes);
    const traceId = await createTrace({ name: "probe", fileName: "probe-test.csv", bytes, imported, actor: TEST_ACTOR });
    const product = JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8"));
    const productId = (await createDefinition("product", product, TEST_ACTOR)).id;

    const { runCalibration } = await import("@/lib/services/calibration");
    const out = await runCalibration({ traceId, productId });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    // 2.5 h = 9000 s; readings rounded to 0.1 K move the estimate by well under 1 %
    expect(Math.abs(out.result.tau_s / 9000 - 1)).toBeLessThan(0.01);

    const { calibrateLumped } = await import("@/lib/design/calibrate");
    const here = calibrateLumped(imported.series.t_s, bridgeGaps(imported.series), imported.series.probe_C!, { fitInitial: false, fitOffset: false, mismatchFactor: 2 }, { product });
    expect(out.result).toEqual(here);
  });
});
