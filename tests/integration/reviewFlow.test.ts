import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { createHash } from "node:crypto";
import { testDatabaseUrl } from "../helpers/database";
import { TEST_ACTOR } from "../helpers/accounts";

// A real SQLite file in a temporary folder, migrated with the committed migrations. The database
// modules read DATABASE_URL when first imported, so they are imported after it is set.
const dir = mkdtempSync(path.join(tmpdir(), "corelag-it-"));
const url = testDatabaseUrl(dir, "test.db");
process.env.DATABASE_URL = url;

type Db = typeof import("@/lib/db");
type Services = typeof import("@/lib/services/reviews");
let dbm: Db;
let services: Services;

const DEMO = path.join(__dirname, "../../public/demo");

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  dbm = await import("@/lib/db");
  services = await import("@/lib/services/reviews");
});

afterAll(async () => {
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

describe("upload → store → review → read back (SQLite)", () => {
  it("stores the original bytes unchanged, and they re-hash to the stored SHA-256", async () => {
    const { importCsv, optionsFromSettings } = await import("@/lib/trace");
    const bytes = readFileSync(path.join(DEMO, "route7-tote3.csv"));
    const id = await dbm.createTrace({ name: "it", fileName: "route7-tote3.csv", bytes, imported: importCsv(bytes), actor: TEST_ACTOR });
    const stored = await dbm.getTrace(id);
    expect(stored).not.toBeNull();
    // a page view loads the series, never the original bytes; those come only for download and verify
    expect(Object.keys(stored!).sort()).toEqual(["meta", "series"]);
    const original = (await dbm.getTraceOriginal(id))!;
    expect(Buffer.compare(Buffer.from(original.bytes), bytes)).toBe(0);
    expect(createHash("sha256").update(original.bytes).digest("hex")).toBe(stored!.meta.sha256);
    expect(original.sha256).toBe(stored!.meta.sha256);
    // the stored series reads back identical to a fresh import of the stored bytes with the stored settings
    const again = importCsv(original.bytes, optionsFromSettings(stored!.meta.importSettings));
    expect(Buffer.compare(Buffer.from(stored!.series.t_s.buffer), Buffer.from(again.series.t_s.buffer))).toBe(0);
    expect(Buffer.compare(Buffer.from(stored!.series.air_C.buffer), Buffer.from(again.series.air_C.buffer))).toBe(0);
  });

  it("runAndStoreReview refuses a stored product that no longer passes the schema by name, and stores nothing", async () => {
    // A body saved before the ranges came in (mass 1e308 kg): written straight to storage, as an old row would be.
    const { importCsv } = await import("@/lib/trace");
    const { db } = await import("@/lib/db/client");
    const bytes = readFileSync(path.join(DEMO, "route7-tote3.csv"));
    const traceId = await dbm.createTrace({ name: "old", fileName: "route7-tote3.csv", bytes, imported: importCsv(bytes), actor: TEST_ACTOR });
    const product = { ...JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8")), name: "legacy tray", mass_kg: 1e308 };
    const p = await dbm.createDefinition("product", product, TEST_ACTOR);
    const l = await dbm.createDefinition("limits", JSON.parse(readFileSync(path.join(DEMO, "ready-meal.limits.json"), "utf8")), TEST_ACTOR);
    const before = await db.review.count();
    const res = await services.runAndStoreReview({ title: "old", traceId, productId: p.id, limitsId: l.id }, TEST_ACTOR);
    expect(res).toEqual({
      ok: false,
      field: "productId",
      message: "the stored product 'legacy tray' v1 is no longer valid: field 'mass_kg': mass must be between 0.001 and 2000 kg; save a corrected version",
    });
    expect(await db.review.count()).toBe(before);
  });

  it("runs a review on stored versions and reads back a result that reproduces bit for bit", async () => {
    const { importCsv } = await import("@/lib/trace");
    const { runReview, resultHash } = await import("@/lib/review");
    const bytes = readFileSync(path.join(DEMO, "route7-tote3.csv"));
    const traceId = await dbm.createTrace({ name: "flow", fileName: "route7-tote3.csv", bytes, imported: importCsv(bytes), actor: TEST_ACTOR });
    const product = JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8"));
    const limits = JSON.parse(readFileSync(path.join(DEMO, "ready-meal.limits.json"), "utf8"));
    const p = await dbm.createDefinition("product", product, TEST_ACTOR);
    const l = await dbm.createDefinition("limits", limits, TEST_ACTOR);
    const res = await services.runAndStoreReview({ title: "flow", traceId, productId: p.id, limitsId: l.id }, TEST_ACTOR);
    expect(res.ok).toBe(true);
    const review = await dbm.getReview((res as { reviewId: string }).reviewId);
    expect(review!.product.id).toBe(p.id);
    expect(review!.limits.version).toBe(1);
    expect(review!.outcome).toBe(review!.result.outcome);
    // tau = m·cp/(h·A) = 0.45·3600/(2.5·0.062) s, from the demo product's own numbers
    expect(review!.result.screening.tau_s).toBeCloseTo((0.45 * 3600) / (2.5 * 0.062), 9);
    expect(review!.result.rules.map((r) => r.id)).toEqual(["core-above-5C", "core-peak-8C", "air-above-8C"]);

    const trace = await dbm.getTrace(traceId);
    const rerun = runReview({ series: trace!.series, product: p.body, limits: l.body });
    expect(resultHash(rerun.result, rerun.core_C)).toBe(review!.resultSha256);
    expect(Buffer.compare(Buffer.from(rerun.core_C.buffer), Buffer.from(review!.core_C.buffer))).toBe(0);
  });

  it("editing a definition adds a version and leaves the old one for the reviews that used it", async () => {
    const product = JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8"));
    const v1 = await dbm.createDefinition("product", product, TEST_ACTOR);
    const v2 = await dbm.reviseDefinition(v1.lineage, { ...product, mass_kg: 0.5 }, TEST_ACTOR);
    expect(v2.version).toBe(2);
    expect((await dbm.getDefinition<{ mass_kg: number }>(v1.id))!.body.mass_kg).toBe(0.45);
    const latest = await dbm.listLatestDefinitions("product");
    expect(latest.find((d) => d.lineage === v1.lineage)!.id).toBe(v2.id);
  });

  it("refuses a review whose limit set needs a channel the model does not produce, storing nothing", async () => {
    const before = await (await import("@/lib/db/client")).db.review.count();
    const product = JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8"));
    const p = await dbm.createDefinition("product", product, TEST_ACTOR);
    const l = await dbm.createDefinition("limits", { name: "probe", rules: [{ id: "probe-5", channel: "probe", above_C: 5 }] }, TEST_ACTOR);
    const traces = await dbm.listTraces();
    const res = await services.runAndStoreReview({ title: "x", traceId: traces[0]!.id, productId: p.id, limitsId: l.id }, TEST_ACTOR);
    expect(res).toEqual({ ok: false, field: "limitsId", message: "rule 'probe-5' is on the 'probe' channel, but this trace has no product-probe column" });
    expect(await (await import("@/lib/db/client")).db.review.count()).toBe(before);
  });
});
