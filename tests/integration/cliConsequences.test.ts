import { describe, it, expect } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { importCsv } from "@/lib/trace/importCsv";
import { bridgeGaps } from "@/lib/trace/series";
import { runReview, ENGINE_VERSION, REPRODUCIBLE_ENGINE_VERSIONS, resultHash, findingsCsv } from "@/lib/review";
import { productSchema } from "@/lib/thermal/definitions";
import { limitSetSchema } from "@/lib/exposure/limits";

const ROOT = path.resolve(__dirname, "../..");
const DEMO = path.join(ROOT, "public/demo");
const tmp = mkdtempSync(path.join(tmpdir(), "corelag-consequence-"));
const TRACE = path.join(DEMO, "route7-tote3.csv");

function corelag(...args: string[]) {
  // the bundled CLI (tests/globalSetup.ts builds it), as users run it
  const r = spawnSync(process.execPath, [path.join(ROOT, "dist/cli/corelag.mjs"), ...args], { cwd: ROOT, encoding: "utf8" });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

const baseProduct = JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8"));
const models = [
  { id: "sl", kind: "shelf_life", reference_C: 4, shelf_life_days: 10, dependence: "sqrt", tmin_C: -10 },
  { id: "lm", kind: "growth", organism: "invented test organism", b_per_C_sqrt_h: 0.02, tmin_C: -1.5, source: "invented for the test" },
];
const product = { ...baseProduct, consequences: models };
const limits = {
  name: "with growth",
  sensor_accuracy_K: 0.5,
  rules: [
    { id: "core-above-5C", channel: "core", above_C: 5, max_cumulative_min: 120 },
    { id: "lm-air", kind: "growth", model: "lm", max_log10_increase: 0.5, channel: "air" },
    { id: "sl-25", kind: "shelf_life", max_consumed_percent: 25 },
  ],
};

describe("corelag review with growth and shelf-life models", () => {
  const productFile = path.join(tmp, "p.json"), limitsFile = path.join(tmp, "l.json");
  writeFileSync(productFile, JSON.stringify(product));
  writeFileSync(limitsFile, JSON.stringify(limits));

  it("prints consequences with id, model, channel, the estimates and their guard band", () => {
    const r = corelag("review", "--trace", TRACE, "--product", productFile, "--limits", limitsFile, "--format", "json");
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.engine_version).toBe(ENGINE_VERSION);
    const ids = out.consequences.map((c: { id: string }) => c.id);
    expect(ids).toEqual(["sl@core", "lm@core", "lm@air"]);
    const sl = out.consequences[0], lm = out.consequences[2];
    expect(sl).toMatchObject({ model: "sl", channel: "core", kind: "shelf_life" });
    for (const k of ["shelf_life_consumed_days", "shelf_life_consumed_percent", "remaining_days_at_C", "lower", "upper"]) expect(typeof sl[k]).toBe("number");
    expect(sl.lower).toBeLessThanOrEqual(sl.shelf_life_consumed_percent);
    expect(sl.upper).toBeGreaterThanOrEqual(sl.shelf_life_consumed_percent);
    expect(lm).toMatchObject({ model: "lm", channel: "air", kind: "growth" });

    // The air channel's growth, recomputed here from the trace by the cubic integral of the square-root model
    // (no lag): Σ b²·Δt·(a² + ab + b²)/3 over intervals, parts below Tmin left out (worked from the formula).
    const imp = importCsv(readFileSync(TRACE));
    const air = bridgeGaps(imp.series);
    let M = 0;
    for (let i = 1; i < air.length; i++) {
      const a = air[i - 1]! + 1.5, b = air[i]! + 1.5, dt = (imp.series.t_s[i]! - imp.series.t_s[i - 1]!) / 3600;
      if (a > 0 && b > 0) M += (0.0004 * dt * (a * a + a * b + b * b)) / 3;
      else if (a > 0 || b > 0) M += (0.0004 * dt * Math.max(a, b) ** 3) / (3 * Math.abs(a - b));
    }
    expect(lm.log10_increase).toBeCloseTo(M / Math.LN10, 5);
    // the comparison with the proxy: minutes of the air above 5 °C (no threshold rule above on the air)
    expect(lm.comparison.threshold_C).toBe(5);
    expect(lm.comparison.minutes_above).toBeGreaterThan(0);

    expect(out.consequence_rules.map((x: { id: string; status: string }) => x.id)).toEqual(["lm-air", "sl-25"]);
    for (const x of out.consequence_rules) expect(["pass", "fail", "inconclusive"]).toContain(x.status);
    expect(out.cautions.join(" ")).toMatch(/do not replace challenge tests/);
  });

  it("prints an empty consequences list for a product without models", () => {
    const r = corelag("review", "--trace", TRACE, "--product", path.join(DEMO, "ready-meal.product.json"), "--limits", path.join(DEMO, "ready-meal.limits.json"), "--format", "json");
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).consequences).toEqual([]);
  });

  it("refuses a growth rule whose model the product does not have, naming the rule", () => {
    const r = corelag("review", "--trace", TRACE, "--product", path.join(DEMO, "ready-meal.product.json"), "--limits", limitsFile, "--format", "json");
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(`corelag review: ${limitsFile}: field 'rules.1': rule 'lm-air' names the growth model 'lm', which the product does not have (${path.join(DEMO, "ready-meal.product.json")})\n`);
  });
});

describe("runReview and stored reviews of earlier engines", () => {
  const imp = importCsv(readFileSync(TRACE));
  it("leaves a review without consequence models as engine 0.4.0 wrote it, and stamps the version it is asked to", () => {
    const input = { series: imp.series, product: productSchema.parse(baseProduct), limits: limitSetSchema.parse(JSON.parse(readFileSync(path.join(DEMO, "ready-meal.limits.json"), "utf8"))) };
    const now = runReview(input);
    expect("consequences" in now.result).toBe(false);
    expect(REPRODUCIBLE_ENGINE_VERSIONS).toContain("0.4.0");
    const old = runReview({ ...input, engineVersion: "0.4.0" });
    expect(old.result.engine_version).toBe("0.4.0");
    // identical but for the stamp: the hash differs only through it
    expect(JSON.stringify({ ...old.result, engine_version: ENGINE_VERSION })).toBe(JSON.stringify(now.result));
    expect(resultHash(old.result, old.core_C)).not.toBe(resultHash(now.result, now.core_C));
  });

  it("the findings CSV lists each consequence and consequence rule", () => {
    const comp = runReview({ series: imp.series, product: productSchema.parse(product), limits: limitSetSchema.parse(limits) });
    const csv = findingsCsv({ id: "r1", title: "t", traceSha256: "x", resultSha256: "y", decision: null, signComment: null, signMeaning: null, signedBy: null, signedAt: null }, comp.result);
    const lm = comp.result.consequences!.find((c) => c.id === "lm@air")!;
    expect(csv).toContain(`lm@air,lm,growth,air,${lm.log10_increase},`);
    expect(csv).toMatch(/\r\nlm-air,growth,lm,air,0\.5,/);
  });
});
