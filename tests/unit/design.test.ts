import { describe, it, expect } from "vitest";
import { size } from "@/lib/design/sizing";
import { monteCarlo } from "@/lib/uncertainty/monteCarlo";
import { profileSeries, EXAMPLE_PROFILES, profileSchema } from "@/lib/design/profile";
import { designValueText, displayOf, parseVariable, valueOf } from "@/lib/design/vary";
import { governingCurve } from "@/lib/design/governing";
import { predict } from "@/lib/thermal/predict";
import type { Pack, Product } from "@/lib/thermal/definitions";
import { expectClose } from "../helpers/numeric";
import { readFileSync } from "node:fs";
import path from "node:path";
import { packSchema, productSchema } from "@/lib/thermal/definitions";
import { limitSetSchema } from "@/lib/exposure/limits";

const DEMO = path.join(__dirname, "../../public/demo");

// A lumped product (5 kg, cp 3600 J/kg·K, area 0.05 m²) in a pack: outside film h = 10 W/m²·K and
// one foam layer (k = 0.03 W/m·K) over 0.05 m², under a constant 25 °C for 24 h, starting at 2 °C.
// Rule: core above 8 °C, no time allowed. Analytically (first-order step response), the core reaches
// θ at t* = tau·ln((Ta − T0)/(Ta − θ)); the product passes for 24 h exactly when tau ≥ 24 h / ln(23/17),
// i.e. R_total ≥ 86,400 / (C·ln(23/17)), i.e. L ≥ k·A·(R_total − 1/(h·A)).
const product: Product = { name: "p", mass_kg: 5, properties: { cp_J_kgK: 3600 }, area_m2: 0.05, initial_C: 2 };
const pack: Pack = { name: "k", h_outside_W_m2K: 10, area_m2: 0.05, layers: [{ name: "foam", thickness_m: 0.01, k_W_mK: 0.03 }], coolants: [] };
const limits = { name: "l", rules: [{ id: "core-8", channel: "core" as const, above_C: 8 }] };
const t = Float64Array.from({ length: 24 * 60 + 1 }, (_, i) => i * 60);
const series = { t_s: t, air_C: new Float64Array(t.length).fill(25) };

describe("size", () => {
  it("size finds the analytic insulation thickness to within 0.1 mm", () => {
    const C = 5 * 3600;
    const rNeeded = 86_400 / (C * Math.log(23 / 17));
    const exact = 0.03 * 0.05 * (rNeeded - 1 / (10 * 0.05));
    const r = size({ series, product, pack, limits, variable: parseVariable("layer:1:thickness_m")!, min: 0.001, max: 0.2 });
    expect(r.feasible).toBe(true);
    expect(r.value!).toBeGreaterThanOrEqual(exact - 1e-9);
    expect(r.value! - exact).toBeLessThanOrEqual(1e-4);
    expect(r.metric_at_value!).toBeLessThanOrEqual(8 + 1e-9);
    // the curve: metric falls as the wall thickens, feasible from the boundary on
    expect(r.curve[0]!.metric).toBeGreaterThan(r.curve[20]!.metric);
    expect(r.curve.filter((c) => c.feasible).every((c) => c.x >= exact - 1e-9)).toBe(true);
  });

  it("size's feasible_range starts at the boundary value, not at the coarse curve's first passing point", () => {
    const r = size({ series, product, pack, limits, variable: parseVariable("layer:1:thickness_m")!, min: 0.001, max: 0.15 });
    // the curve's points are (150 − 1)/20 = 7.45 mm apart; the analytic boundary (20.82 mm) lies between
    // 15.9 and 23.35 mm, so the first passing point is 2.4 mm beyond it
    const firstPassing = r.curve.find((c) => c.feasible)!.x;
    expect(firstPassing).toBeCloseTo(0.02335, 12);
    // the analytic boundary, 0.0015·(86400/(18000·ln(23/17)) − 2) = 20.82 mm, on the 0.1 mm grid on the safe side
    expect(r.value).toBe(0.0209);
    expect(r.feasible_range).toEqual([0.0209, 0.15]);
    // a colder start helps: the range runs from the coldest start to the warmest feasible one
    const warm = size({ series, product, pack, limits, variable: parseVariable("product:initial_C")!, min: -40, max: 8 });
    expect(warm.feasible_range).toEqual([-40, warm.value]);
    expect(size({ series, product, pack, limits, variable: parseVariable("layer:1:thickness_m")!, min: 0.001, max: 0.01 }).feasible_range).toBeNull();
  });

  it("size gives the curve's measures at the value found, so a chart's line passes through the boundary, and it passes there", () => {
    const r = size({ series, product, pack, limits, variable: parseVariable("layer:1:thickness_m")!, min: 0.001, max: 0.15 });
    expect(r.point_at_value).toMatchObject({ x: 0.0209, feasible: true, failing: [] });
    expect(r.point_at_value!.metric).toBe(r.metric_at_value);
    // not one of the 21 evenly spaced points (15.9 and 23.35 mm lie either side), and the CLI's curve keeps its 21
    expect(r.curve.some((c) => c.x === 0.0209)).toBe(false);
    expect(r.curve).toHaveLength(21);
    expect(size({ series, product, pack, limits, variable: parseVariable("layer:1:thickness_m")!, min: 0.001, max: 0.01 }).point_at_value).toBeNull();
  });

  it("size reports a range that holds no feasible value", () => {
    const r = size({ series, product, pack, limits, variable: parseVariable("layer:1:thickness_m")!, min: 0.001, max: 0.01 });
    expect(r).toMatchObject({ feasible: false, value: null });
    expect(r.reason).toMatch(/no foam thickness between 1\.0 mm and 10\.0 mm passes every rule/);
    // the reason says which rule fails at the best end of the range, and how
    expect(r.governing.map((g) => g.id)).toEqual(["core-8"]);
    expect(r.reason).toMatch(/At 10\.0 mm, the best end of the range, rule core-8 fails: \d+(\.\d)? min beyond, none allowed/);
    expect(r.rule_notes).toEqual([expect.objectContaining({ id: "core-8", kind: "fails-throughout" })]);
  });

  it("size finds the warmest feasible initial temperature to within 0.01 K", () => {
    // with the 10 mm wall: tau = R·C, R = 1/(10·0.05) + 0.01/(0.03·0.05); the start T0 passes when
    // 25 − (25 − T0)·e^(−86400/tau) ≤ 8, i.e. T0 ≤ 25 − 17·e^(86400/tau)
    const tau = (1 / 0.5 + 0.01 / 0.0015) * 18_000;
    const exact = 25 - 17 * Math.exp(86_400 / tau);
    const r = size({ series, product, pack, limits, variable: parseVariable("product:initial_C")!, min: -40, max: 8 });
    expect(r.value!).toBeLessThanOrEqual(exact + 1e-9);
    expect(exact - r.value!).toBeLessThanOrEqual(0.01);
  });
});

describe("valueOf and designValueText", () => {
  it("valueOf reads the variable's value from the definitions, and designValueText says it in the user's unit", () => {
    const v = parseVariable("layer:1:thickness_m")!;
    // the fixture's foam layer is 10 mm thick (invented fixture, above)
    expect(valueOf(product, pack, v)).toBe(0.01);
    expect(designValueText(0.0337, displayOf(v, pack))).toBe("foam thickness 33.7 mm");
    expect(valueOf(product, pack, parseVariable("product:initial_C")!)).toBe(2);
    expect(designValueText(2, displayOf(parseVariable("product:initial_C")!, pack))).toBe("product initial temperature 2.00 °C");
    expect(() => valueOf(product, pack, parseVariable("coolant:1:mass_kg")!)).toThrow("the pack has no coolant 1");
  });
});

describe("monteCarlo", () => {
  const wall = { ...pack, layers: [{ name: "foam", thickness_m: 0.02, k_W_mK: 0.03 }] };

  it("monteCarlo with zero uncertainty collapses onto the deterministic prediction", () => {
    const r = monteCarlo(series, product, wall, limits, { inputs: [{ path: "pack.layers.0.k_W_mK", plusminus: 0, percent: true, distribution: "normal" }], samples: 20, seed: 3, use_in_guard_band: false });
    const det = predict(product, wall, series.t_s, series.air_C, { model: "auto" }).core;
    expect(Array.from(r.p05)).toEqual(Array.from(det));
    expect(Array.from(r.p95)).toEqual(Array.from(det));
    expect(r.half_width_K).toBe(0);
  });

  it("monteCarlo's spread matches the analytic propagation for a linear sensitivity", () => {
    // Under constant air the core depends linearly on the start: dT(t)/dT0 = exp(−t/tau). With T0 normal
    // (σ = 1 K), the 5–95 % band at t has half-width 1.645·exp(−t/tau) K (normal quantile 1.6449).
    const r = monteCarlo(series, product, wall, limits, { inputs: [{ path: "product.initial_C", plusminus: 1, percent: false, distribution: "normal" }], samples: 4000, seed: 11, use_in_guard_band: false });
    const tau = (1 / 0.5 + 0.02 / 0.0015) * 18_000;
    for (const i of [0, 360, 720]) {
      const expected = 1.6449 * Math.exp(-t[i]! / tau);
      // sampling error of a 5 % / 95 % quantile from 4,000 draws: about 2–3 % of the spread
      expectClose((r.p95[i]! - r.p05[i]!) / 2, expected, { rel: 0.06 });
    }
  });

  it("monteCarlo is reproducible: the same seed gives the same band", () => {
    const spec = { inputs: [{ path: "pack.h_outside_W_m2K", plusminus: 20, percent: true, distribution: "uniform" as const }], samples: 50, seed: 5, use_in_guard_band: false };
    const a = monteCarlo(series, product, wall, limits, spec);
    const b = monteCarlo(series, product, wall, limits, spec);
    expect(Array.from(a.p95)).toEqual(Array.from(b.p95));
    expect(a.fail_fraction).toEqual(b.fail_fraction);
  });
});

describe("profiles", () => {
  it("profileSeries builds holds, ramps and repeats at the sampling interval", () => {
    const p = profileSchema.parse({ name: "x", start: "2026-07-01T00:00:00Z", interval_s: 60, initial_C: 4, segments: [{ kind: "hold", C: 4, duration_min: 2 }, { kind: "ramp", to_C: 10, duration_min: 3 }, { kind: "repeat", count: 2, segments: [{ kind: "hold", C: 20, duration_min: 1 }] }] });
    const s = profileSeries(p);
    expect(Array.from(s.air_C)).toEqual([4, 4, 4, 6, 8, 20, 20, 20]);
    expect(s.t_s[0]).toBe(Date.UTC(2026, 6, 1) / 1000);
  });
  it("the example profiles are valid and labelled as examples", () => {
    for (const p of EXAMPLE_PROFILES) {
      expect(profileSchema.safeParse(p).success).toBe(true);
      expect(p.name.startsWith("Example:")).toBe(true);
    }
  });
});

describe("size with a rule that is not monotone in the variable", () => {
  it("size reports when thinner walls also pass a longest-continuous-time rule, and gives the lasting boundary", () => {
    // A thin wall lets the core heat fast and cool fast (short excursions above 8 °C); a thicker wall
    // stretches each excursion past the 240-minute allowance; a much thicker one keeps the core below 8 °C.
    const tray: Product = { name: "tray", mass_kg: 0.45, properties: { cp_J_kgK: 3600 }, area_m2: 0.062, initial_C: 3.2 };
    const box: Pack = { name: "box", h_outside_W_m2K: 8, area_m2: 0.1, layers: [{ name: "foam", thickness_m: 0.01, k_W_mK: 0.035 }], coolants: [] };
    const rule = { name: "uk", rules: [{ id: "core-above-8C", channel: "core" as const, above_C: 8, max_continuous_min: 240 }] };
    const r = size({ series: profileSeries(EXAMPLE_PROFILES[0]!), product: tray, pack: box, limits: rule, variable: parseVariable("layer:1:thickness_m")!, min: 0.001, max: 0.15 });
    expect(r.feasible).toBe(true);
    expect(r.curve[0]!.feasible).toBe(true); // 1 mm passes: short excursions
    expect(r.curve.some((c) => !c.feasible)).toBe(true);
    expect(r.reason).toMatch(/feasibility is not monotone in foam thickness here/);
    // every curve point from the value on passes
    expect(r.curve.filter((c) => c.x >= r.value!).every((c) => c.feasible)).toBe(true);
    expect(r.value!).toBeGreaterThan(0.05);
  });
});

describe("size says why", () => {
  it("size reports the boundary on the grid of its precision, on the safe side", () => {
    const r = size({ series, product, pack, limits, variable: parseVariable("layer:1:thickness_m")!, min: 0.001, max: 0.2 });
    // a whole number of 0.1 mm steps, with no binary noise in its decimal form
    expect(String(r.value)).toMatch(/^0\.\d{1,4}$/);
    expect(r.display.label).toBe("foam thickness, mm");
    expect(r.governing.map((g) => g.id)).toEqual(["core-8"]);
    expect(r.reason).toMatch(/smallest feasible foam thickness, to within 0\.1 mm; set by rule core-8/);
    // the value passes and one step thinner does not (the grid's smallest feasible value)
    const thinner = size({ series, product, pack, limits, variable: parseVariable("layer:1:thickness_m")!, min: 0.001, max: r.value! - 1e-4 });
    expect(thinner.feasible).toBe(false);
  });

  it("size marks an air rule before the search and names it as the rule that fails at the best end", () => {
    const withAir = { name: "l", rules: [...limits.rules, { id: "air-8", channel: "air" as const, above_C: 8, max_cumulative_min: 60 }] };
    const r = size({ series, product, pack, limits: withAir, variable: parseVariable("layer:1:thickness_m")!, min: 0.001, max: 0.2 });
    expect(r.feasible).toBe(false);
    // constant 25 °C air for 24 h: 1440 min beyond 8 °C against 60 allowed, whatever the wall
    expect(r.rule_notes[0]).toMatchObject({ id: "air-8", kind: "independent" });
    expect(r.rule_notes[0]!.advice).toMatch(/judges the air, which no foam thickness changes: drop it from the limit set used for design/);
    expect(r.governing.map((g) => g.id)).toEqual(["air-8"]);
    expect(r.reason).toMatch(/At 200\.0 mm, the best end of the range, rule air-8 fails: 1440 min cumulative > 60 min allowed/);
  });

  it("the demo product, pack, design limit set and summer profile size successfully", () => {
    const demo = (f: string) => JSON.parse(readFileSync(path.join(DEMO, f), "utf8"));
    const r = size({
      series: profileSeries(profileSchema.parse(demo("summer-route.profile.json"))),
      product: productSchema.parse(demo("ready-meal-shaped.product.json")),
      pack: packSchema.parse(demo("tote.pack.json")),
      limits: limitSetSchema.parse(demo("tote-design.limits.json")),
      variable: parseVariable("layer:1:thickness_m")!,
      min: 0.001,
      max: 0.15,
    });
    expect(r.rule_notes).toEqual([]);
    expect(r.feasible).toBe(true);
    expect(r.display.label).toBe("EPS wall thickness, mm");
    // on the grid of 0.1 mm, between the curve's points that bracket it
    expect(Math.abs(r.value! * 1e4 - Math.round(r.value! * 1e4))).toBeLessThan(1e-6);
    expect(r.value!).toBeGreaterThan(0.01);
    expect(r.value!).toBeLessThan(0.1);
  });
});

describe("governingCurve", () => {
  const m = (extreme_C: number, cumulative_min: number, longest_min: number) => ({ status: "fail" as const, extreme_C, cumulative_min, longest_min });

  it("governingCurve plots the peak against a peak limit, with the guard band's pass line", () => {
    const g = governingCurve({ id: "core-peak-8C", channel: "core", above_C: 8, max_peak_C: 8 }, 0.5, m(7.7, 30, 30));
    // 7.7 + 0.5 > 8: the peak allowance is what fails
    expect(g).toMatchObject({ quantity: "extreme_C", label: "peak core temperature, °C", limit: { value: 8 }, pass: { value: 7.5 } });
  });

  it("governingCurve plots time beyond the guard-banded threshold against a cumulative allowance", () => {
    const g = governingCurve({ id: "core-above-5C", channel: "core", above_C: 5, max_cumulative_min: 120 }, 0.5, m(6, 150, 60));
    expect(g).toMatchObject({ quantity: "cumulative_min", limit: { value: 120 }, pass: null });
    expect(g.label).toBe("time of the core above 4.5 °C, min");
    expect(g.note).toBe("4.5 °C is rule core-above-5C's 5 °C threshold less the 0.5 K guard band");
  });

  it("governingCurve treats a rule without allowances as a peak limited by its threshold", () => {
    const g = governingCurve({ id: "core-8", channel: "core", above_C: 8 }, 0, m(9, 10, 10));
    expect(g).toMatchObject({ quantity: "extreme_C", limit: { value: 8 }, pass: null });
  });

  it("size gives the chart of the rule that sets the boundary", () => {
    const demo = (f: string) => JSON.parse(readFileSync(path.join(DEMO, f), "utf8"));
    const r = size({
      series: profileSeries(profileSchema.parse(demo("summer-route.profile.json"))),
      product: productSchema.parse(demo("ready-meal-shaped.product.json")),
      pack: packSchema.parse(demo("tote.pack.json")),
      limits: limitSetSchema.parse(demo("tote-design.limits.json")),
      variable: parseVariable("layer:1:thickness_m")!,
      min: 0.001,
      max: 0.15,
      curvePoints: 11,
    });
    expect(r.chart).toMatchObject({ rule_id: "core-above-5C", quantity: "cumulative_min", limit: { value: 120 } });
    // the plotted measure crosses the limit between the last failing and the first passing curve point
    const pts = r.curve.map((c) => ({ x: c.x, y: c.rules["core-above-5C"]!.cumulative_min, ok: c.feasible }));
    const lastBad = pts.filter((p) => !p.ok).at(-1)!, firstGood = pts.find((p) => p.ok)!;
    expect(lastBad.y).toBeGreaterThan(120);
    expect(firstGood.y).toBeLessThanOrEqual(120);
  });
});
