import { describe, it, expect } from "vitest";
import { readFileSync } from "node:fs";
import path from "node:path";
import { size } from "@/lib/design/sizing";
import { monteCarlo } from "@/lib/uncertainty/monteCarlo";
import { profileSeries, profileSchema } from "@/lib/design/profile";
import { parseVariable } from "@/lib/design/vary";
import { packSchema, productSchema } from "@/lib/thermal/definitions";
import { limitSetSchema } from "@/lib/exposure/limits";
import { uncertaintySpecSchema } from "@/lib/uncertainty/monteCarlo";
import { runReview } from "@/lib/review/runReview";

const DEMO = path.join(__dirname, "../../public/demo");
const demo = (f: string) => JSON.parse(readFileSync(path.join(DEMO, f), "utf8"));
const growthModel = { id: "lm", kind: "growth", organism: "invented test organism", b_per_C_sqrt_h: 0.03, tmin_C: -1.5, source: "invented for the test" };

describe("growth rules in design studies", () => {
  it("size finds the wall that keeps growth within a growth rule, and names that rule as governing with its curve", () => {
    const product = productSchema.parse({ ...demo("ready-meal-shaped.product.json"), consequences: [growthModel] });
    const limits = limitSetSchema.parse({ name: "growth only", sensor_accuracy_K: 0.5, rules: [{ id: "lm-0.3", kind: "growth", model: "lm", max_log10_increase: 0.3 }] });
    const r = size({
      series: profileSeries(profileSchema.parse(demo("summer-route.profile.json"))),
      product,
      pack: packSchema.parse(demo("tote.pack.json")),
      limits,
      variable: parseVariable("layer:1:thickness_m")!,
      min: 0.001,
      max: 0.15,
      curvePoints: 11,
    });
    expect(r.feasible).toBe(true);
    expect(r.governing.map((g) => g.id)).toEqual(["lm-0.3"]);
    expect(r.chart).toMatchObject({ rule_id: "lm-0.3", quantity: "consequence", limit: { value: 0.3 } });
    // the curve's consequence (at T + u) falls as the wall thickens, and crosses the limit at the boundary
    const values = r.curve.map((c) => c.rules["lm-0.3"]!.consequence!);
    for (let i = 1; i < values.length; i++) expect(values[i]!).toBeLessThanOrEqual(values[i - 1]! + 1e-12);
    const at = r.curve.filter((c) => c.x >= r.value!).map((c) => c.rules["lm-0.3"]!.consequence!);
    for (const v of at) expect(v).toBeLessThanOrEqual(0.3);
  });

  it("monteCarlo gives a growth rule's failure fraction: none with a generous limit, some with a tight one", () => {
    const product = productSchema.parse({ name: "p", mass_kg: 2, properties: { cp_J_kgK: 3600 }, area_m2: 0.05, h_W_m2K: 5, initial_C: 4, consequences: [growthModel] });
    const t = Float64Array.from({ length: 24 * 12 + 1 }, (_, i) => i * 300);
    const series = { t_s: t, air_C: new Float64Array(t.length).fill(10) };
    const spec = uncertaintySpecSchema.parse({ inputs: [{ path: "product.consequences.0.b_per_C_sqrt_h", plusminus: 20, percent: true }], samples: 200, seed: 7 });
    const loose = limitSetSchema.parse({ name: "l", rules: [{ id: "g", kind: "growth", model: "lm", max_log10_increase: 5 }] });
    expect(monteCarlo(series, product, undefined, loose, spec).fail_fraction.g).toBe(0);
    // the nominal increase is the median of a monotone function of b: a limit at it fails about half the samples
    const central = runReview({ series, product, limits: loose }).result.consequences!.find((c) => c.id === "lm@core")!.log10_increase!;
    const tight = limitSetSchema.parse({ name: "l", rules: [{ id: "g", kind: "growth", model: "lm", max_log10_increase: central }] });
    const f = monteCarlo(series, product, undefined, tight, spec).fail_fraction.g!;
    expect(f).toBeGreaterThan(0.35);
    expect(f).toBeLessThan(0.65);
  });
});
