import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { TEST_ACTOR } from "../helpers/accounts";

// Reviews stored by engine 0.4.0 (before growth and shelf life) still verify bit for bit under 0.5.0; a review of
// an engine whose results are not reproducible is reported as such. A real SQLite file, the real services.
const dir = mkdtempSync(path.join(tmpdir(), "corelag-cons-"));
const url = `file:${path.join(dir, "cons.db")}`;
process.env.DATABASE_URL = url;
const DEMO = path.join(path.resolve(__dirname, "../.."), "public/demo");

let ids: { traceId: string; productId: string; limitsId: string };

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  const { importCsv } = await import("@/lib/trace");
  const dbm = await import("@/lib/db");
  const bytes = readFileSync(path.join(DEMO, "route7-tote3.csv"));
  const traceId = await dbm.createTrace({ name: "cons", fileName: "route7-tote3.csv", bytes, imported: importCsv(bytes), actor: TEST_ACTOR });
  const p = await dbm.createDefinition("product", JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8")), TEST_ACTOR);
  const l = await dbm.createDefinition("limits", JSON.parse(readFileSync(path.join(DEMO, "ready-meal.limits.json"), "utf8")), TEST_ACTOR);
  ids = { traceId, productId: p.id, limitsId: l.id };
});

afterAll(async () => {
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

/** Stores the demo review as the given engine version would have (its result stamped with that version). */
async function storeAs(version: string): Promise<string> {
  const { prepareReview } = await import("@/lib/services/reviews");
  const { runReview, resultHash } = await import("@/lib/review");
  const { createReview } = await import("@/lib/db/reviews");
  const prep = await prepareReview({ title: `as ${version}`, ...ids });
  if (!prep.ok) throw new Error(prep.message);
  const comp = runReview({ ...prep.prepared.input, engineVersion: version });
  return createReview({ title: `as ${version}`, ...ids, options: prep.prepared.input.options as unknown as Record<string, unknown>, engineVersion: version, computation: comp, resultSha256: resultHash(comp.result, comp.core_C), actor: TEST_ACTOR });
}

describe("stored reviews across the 0.5.0 engine change", () => {
  it("a review stored by engine 0.4.0 is reproduced (re-run as 0.4.0)", async () => {
    const { verifyStoredReview } = await import("@/lib/services/reviews");
    const id = await storeAs("0.4.0");
    expect(await verifyStoredReview(id)).toMatchObject({ reproduced: true, problems: [] });
  });

  it("a review of an engine not listed as reproducible is reported with both versions", async () => {
    const { verifyStoredReview } = await import("@/lib/services/reviews");
    const { ENGINE_VERSION } = await import("@/lib/review");
    const id = await storeAs("0.3.0");
    const check = await verifyStoredReview(id);
    expect(check.reproduced).toBe(false);
    expect(check.problems).toContain(`recorded with engine 0.3.0; this is engine ${ENGINE_VERSION}`);
  });

  it("a review with growth and shelf-life models stores and reproduces them", async () => {
    const dbm = await import("@/lib/db");
    const { runAndStoreReview, verifyStoredReview } = await import("@/lib/services/reviews");
    const { getReview } = await import("@/lib/db/reviews");
    const product = { ...JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8")), consequences: [{ id: "lm", kind: "growth", organism: "o", b_per_C_sqrt_h: 0.02, tmin_C: -1.5, q0: 0.1, source: "invented for the test" }] };
    const p = await dbm.createDefinition("product", product, TEST_ACTOR);
    const l = await dbm.createDefinition("limits", { name: "g", rules: [{ id: "g", kind: "growth", model: "lm", max_log10_increase: 1 }] }, TEST_ACTOR);
    const res = await runAndStoreReview({ title: "growth", traceId: ids.traceId, productId: p.id, limitsId: l.id }, TEST_ACTOR);
    if (!res.ok) throw new Error(res.message);
    const stored = await getReview(res.reviewId);
    expect(stored!.result.consequences![0]!.id).toBe("lm@core");
    expect(stored!.result.consequence_rules![0]!.status).toMatch(/pass|inconclusive|fail/);
    expect(await verifyStoredReview(res.reviewId)).toMatchObject({ reproduced: true });
    // a limit set whose growth rule names a model the product lacks is refused by field, nothing stored
    const plain = await dbm.createDefinition("product", JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8")), TEST_ACTOR);
    expect(await runAndStoreReview({ title: "x", traceId: ids.traceId, productId: plain.id, limitsId: l.id }, TEST_ACTOR)).toEqual({
      ok: false,
      field: "limitsId",
      message: "rule 'g' names the growth model 'lm', which the product does not have: choose a product that has it, or add it to this product",
    });
  });
});
