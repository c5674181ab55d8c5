import { describe, it, expect } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";

const ROOT = path.resolve(__dirname, "../..");
const DEMO = path.join(ROOT, "public/demo");
const tmp = mkdtempSync(path.join(tmpdir(), "corelag-cli-"));

function corelag(...args: string[]) {
  // The bundled CLI (tests/globalSetup.ts builds it), as users run it.
  const r = spawnSync(process.execPath, [path.join(ROOT, "dist/cli/corelag.mjs"), ...args], {
    cwd: ROOT,
    encoding: "utf8",
  });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe("corelag review (CLI)", () => {
  it("prints the review as JSON and exits 0", () => {
    const r = corelag("review", "--trace", path.join(DEMO, "route7-tote3.csv"), "--product", path.join(DEMO, "ready-meal.product.json"), "--limits", path.join(DEMO, "ready-meal.limits.json"), "--format", "json");
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.screening.tau_s).toBeCloseTo((0.45 * 3600) / (2.5 * 0.062), 9);
    expect(out.rules[0]).toMatchObject({ id: "core-above-5C", channel: "core", status: "fail" });
    expect(typeof out.rules[0].cumulative_min).toBe("number");
    expect(out.outcome).toBe("reject");
    expect(out.cautions.length).toBeGreaterThan(0);
  });

  it("exits non-zero with one line naming the file and field at fault", () => {
    const bad = path.join(tmp, "bad.product.json");
    writeFileSync(bad, JSON.stringify({ name: "x", mass_kg: 1, properties: { cp_J_kgK: -5 }, area_m2: 0.1, h_W_m2K: 5, initial_C: 3 }));
    const r = corelag("review", "--trace", path.join(DEMO, "route7-tote3.csv"), "--product", bad, "--limits", path.join(DEMO, "ready-meal.limits.json"));
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toBe(`corelag review: ${bad}: field 'properties.cp_J_kgK': specific heat must be between 500 and 6000 J/(kg·K)\n`);
  });

  it("exits 2 naming the file and field for mass_kg 1e308 and for an unknown field", () => {
    // issue #9: this exited 3 with the solver's "tau_s must be positive and finite", naming neither
    const huge = path.join(tmp, "huge.product.json");
    writeFileSync(huge, JSON.stringify({ name: "x", mass_kg: 1e308, properties: { cp_J_kgK: 3600 }, area_m2: 0.1, h_W_m2K: 5, initial_C: 3 }));
    const r = corelag("review", "--trace", path.join(DEMO, "route7-tote3.csv"), "--product", huge, "--limits", path.join(DEMO, "ready-meal.limits.json"));
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(`corelag review: ${huge}: field 'mass_kg': mass must be between 0.001 and 2000 kg\n`);
    const typo = path.join(tmp, "typo.product.json");
    writeFileSync(typo, JSON.stringify({ name: "x", mass_kg: 0.45, mass_g: 450, properties: { cp_J_kgK: 3600 }, area_m2: 0.1, h_W_m2K: 5, initial_C: 3 }));
    const t = corelag("review", "--trace", path.join(DEMO, "route7-tote3.csv"), "--product", typo, "--limits", path.join(DEMO, "ready-meal.limits.json"));
    expect(t.code).toBe(2);
    expect(t.stderr).toBe(`corelag review: ${typo}: the document: unknown field 'mass_g' (did you mean 'mass_kg'?)\n`);
  });

  it("names the row and column of a bad trace cell", () => {
    const trace = path.join(tmp, "bad.csv");
    writeFileSync(trace, "Time,Air\n2026-01-01T00:00:00Z,3.1\n2026-01-01T00:01:00Z,3,2\n");
    const r = corelag("review", "--trace", trace, "--product", path.join(DEMO, "ready-meal.product.json"), "--limits", path.join(DEMO, "ready-meal.limits.json"));
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(`corelag review: ${trace}: row 3: expected 2 fields but found 3\n`);
  });

  it("refuses an unknown time zone flag", () => {
    const r = corelag("review", "--trace", "x.csv", "--product", "p.json", "--limits", "l.json", "--tz", "Mars/Olympus");
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--tz: is not a known IANA time zone/);
  });
});

describe("corelag predict and import (CLI)", () => {
  const sphere = path.join(tmp, "sphere.product.json");
  writeFileSync(
    sphere,
    JSON.stringify({ name: "cheese ball", shape: { kind: "sphere", radius_m: 0.06 }, properties: { density_kg_m3: 1100, cp_J_kgK: 3000, k_W_mK: 0.35 }, initial_C: 4, h_W_m2K: 8 }),
  );

  it("predict prints screening and series, choosing conduction when Bi ≥ 0.1", () => {
    const r = corelag("predict", "--trace", path.join(DEMO, "route7-tote3.csv"), "--product", sphere, "--model", "auto", "--format", "json");
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    // Lc = r/3 = 0.02 m, Bi = 8·0.02/0.35 = 0.457
    expect(out.screening.lc_m).toBeCloseTo(0.02, 12);
    expect(out.screening.biot).toBeCloseTo((8 * 0.02) / 0.35, 12);
    expect(out.screening.model).toBe("conduction");
    expect(out.screening.reason).toMatch(/lumped core differs from the conduction core by up to/);
    expect(Object.keys(out.screening)).toEqual(expect.arrayContaining(["biot", "tau_s", "lc_m", "r_total_K_W", "c_total_J_K", "model", "reason"]));
    expect(out.series.t).toHaveLength(361);
    expect(out.series.t[0]).toBe("2026-06-16T03:00:00.000Z");
    for (const k of ["air", "core", "surface", "mean"]) expect(out.series[k]).toHaveLength(361);
    // the surface leads the core on the way up: at the end of the dock delay it is warmer
    const i = out.series.t.indexOf("2026-06-16T09:10:00.000Z");
    expect(out.series.surface[i]).toBeGreaterThan(out.series.core[i]);
  });

  it("predict --out writes the series as CSV and keeps only the screening in the JSON", () => {
    const csv = path.join(tmp, "series.csv");
    const r = corelag("predict", "--trace", path.join(DEMO, "route7-tote3.csv"), "--product", path.join(DEMO, "ready-meal.product.json"), "--out", csv);
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.series).toBeUndefined();
    expect(out.screening.model).toBe("lumped");
    const lines = readFileSync(csv, "utf8").trim().split("\r\n");
    expect(lines[0]).toBe("time_utc,air_C,core_C,surface_C,mean_C");
    expect(lines).toHaveLength(362);
  });

  it("import prints samples, channels, interval and gaps", () => {
    const trace = path.join(tmp, "gappy.csv");
    writeFileSync(trace, "Time,Air (°F)\n2026-01-01T00:00:00Z,41\n2026-01-01T00:05:00Z,NA\n2026-01-01T00:10:00Z,\n2026-01-01T00:15:00Z,42\n2026-01-01T00:20:00Z,43\n");
    const r = corelag("import", trace, "--format", "json");
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout)).toMatchObject({
      samples: 5,
      channels: [{ name: "Air (°F)", role: "air", unit: "F" }],
      start: "2026-01-01T00:00:00.000Z",
      end: "2026-01-01T00:20:00.000Z",
      median_interval_s: 300,
      gaps: [{ start: "2026-01-01T00:00:00.000Z", end: "2026-01-01T00:15:00.000Z", duration_s: 900 }],
      warnings: ["1 gap(s) in the air readings (missing values, or pauses over 3 median intervals); the models bridge them linearly and rules across them are at best inconclusive"],
    });
  });
});

describe("corelag calibrate and size (CLI)", () => {
  it("calibrate fits tau to the demo probe test (simulant made with tau = 2.5 h)", () => {
    const r = corelag("calibrate", "--trace", path.join(DEMO, "probe-test.csv"), "--product", path.join(DEMO, "ready-meal.product.json"), "--format", "json");
    expect(r.stderr).toBe("");
    const out = JSON.parse(r.stdout);
    expect(Object.keys(out)).toEqual(expect.arrayContaining(["tau_s", "tau_ci95_s", "rmse_K", "samples", "r_total_K_W", "h_eff_W_m2K", "warnings"]));
    // readings rounded to 0.1 K move the estimate by well under 1 %
    expect(Math.abs(out.tau_s / 9000 - 1)).toBeLessThan(0.01);
    expect(out.samples).toBe(481);
  });

  it("calibrate refuses a trace without a product-probe channel", () => {
    const r = corelag("calibrate", "--trace", path.join(DEMO, "route7-tote3.csv"));
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/no product-probe column was found; name it with --product-col/);
  });

  it("size prints the boundary value and the metric curve for a JSON profile", () => {
    const limits = path.join(tmp, "size.limits.json");
    writeFileSync(limits, JSON.stringify({ name: "chilled", rules: [{ id: "core-above-5C", channel: "core", above_C: 5, max_cumulative_min: 120 }] }));
    const r = corelag("size", "--profile", path.join(DEMO, "summer-route.profile.json"), "--product", path.join(DEMO, "ready-meal-shaped.product.json"), "--pack", path.join(DEMO, "tote.pack.json"), "--limits", limits, "--vary", "layer:1:thickness_m", "--min", "0.005", "--max", "0.1", "--format", "json");
    expect(r.stderr).toBe("");
    const out = JSON.parse(r.stdout);
    expect(out).toMatchObject({ variable: "layer:1:thickness_m", feasible: true });
    expect(out.curve).toHaveLength(21);
    expect(out.value).toBeGreaterThan(0.005);
    // just below the boundary the rule fails: the curve's last infeasible point lies below the value
    expect(out.curve.filter((c: { feasible: boolean; x: number }) => !c.feasible).every((c: { x: number }) => c.x < out.value)).toBe(true);
  });

  it("size reports the demo's boundary to the search precision, in the user's words, and says which rule sets it", () => {
    // the demo's design limit set (core rules of the example plan) against the summer profile
    const r = corelag("size", "--profile", path.join(DEMO, "summer-route.profile.json"), "--product", path.join(DEMO, "ready-meal-shaped.product.json"), "--pack", path.join(DEMO, "tote.pack.json"), "--limits", path.join(DEMO, "tote-design.limits.json"), "--vary", "layer:1:thickness_m", "--min", "0.001", "--max", "0.15", "--format", "json");
    expect(r.stderr).toBe("");
    const out = JSON.parse(r.stdout);
    expect(out.feasible).toBe(true);
    // a number on the 0.1 mm grid, printed without binary noise (it was 0.033651953124999995)
    expect(typeof out.value).toBe("number");
    expect(r.stdout).toMatch(/"value": 0\.\d{1,4},/);
    expect(out.label).toBe("EPS wall thickness, mm");
    expect(out.value_display).toBeCloseTo(out.value * 1000, 6);
    expect(out.governing.map((g: { id: string }) => g.id)).toEqual(["core-above-5C"]);
    expect(out.rule_notes).toEqual([]);
  });

  it("size with the full demo plan names its air rule and the reason no thickness passes", () => {
    const r = corelag("size", "--profile", path.join(DEMO, "summer-route.profile.json"), "--product", path.join(DEMO, "ready-meal-shaped.product.json"), "--pack", path.join(DEMO, "tote.pack.json"), "--limits", path.join(DEMO, "ready-meal.limits.json"), "--vary", "layer:1:thickness_m", "--min", "0.001", "--max", "0.15", "--format", "json");
    const out = JSON.parse(r.stdout);
    expect(out.feasible).toBe(false);
    expect(out.rule_notes).toEqual([expect.objectContaining({ id: "air-above-8C", kind: "independent" })]);
    expect(out.reason).toMatch(/At 150\.0 mm, the best end of the range, rule air-above-8C fails/);
  });

  it("size names a bad --vary", () => {
    const r = corelag("size", "--profile", "p.json", "--product", "x", "--limits", "y", "--vary", "layer:one", "--min", "0", "--max", "1");
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--vary: 'layer:one' is not layer:N:thickness_m/);
  });
});

describe("corelag review --uncertainty (CLI)", () => {
  it("adds a seeded Monte Carlo band and widens the guard band when asked", () => {
    const spec = path.join(tmp, "u.json");
    writeFileSync(spec, JSON.stringify({ inputs: [{ path: "product.h_W_m2K", plusminus: 20, percent: true, distribution: "normal" }], samples: 200, seed: 7, use_in_guard_band: true }));
    const args = ["review", "--trace", path.join(DEMO, "route7-tote3.csv"), "--product", path.join(DEMO, "ready-meal.product.json"), "--limits", path.join(DEMO, "ready-meal.limits.json")];
    const a = JSON.parse(corelag(...args, "--uncertainty", spec).stdout);
    const b = JSON.parse(corelag(...args, "--uncertainty", spec).stdout);
    expect(a.uncertainty).toMatchObject({ samples: 200, seed: 7, used_in_guard_band: true });
    expect(a.uncertainty.half_width_K).toBeGreaterThan(0);
    expect(a.uncertainty).toEqual(b.uncertainty); // same seed, same result
    // the core rules' guard band now holds the sensor accuracy (0.5 K) plus the band's half-width
    const core = a.rules.find((r: { id: string }) => r.id === "core-above-5C");
    expect(core.guard_K).toBeCloseTo(0.5 + a.uncertainty.half_width_K, 4); // the summary rounds the half-width to 4 decimals
    const air = a.rules.find((r: { id: string }) => r.id === "air-above-8C");
    expect(air.guard_K).toBe(0.5);
  });
});
