import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { growthModelSchema, shelfLifeModelSchema, type GrowthModel, type ShelfLifeModel } from "@/lib/consequence/definitions";
import { growthRate, relativeRate, R_J_molK } from "@/lib/consequence/rates";
import { cumulativeIntegral, segmentIntegral } from "@/lib/consequence/integrate";
import { lnIncrease, q0FromLag } from "@/lib/consequence/baranyi";
import { evaluateConsequence, evaluateGrowth, evaluateShelfLife, type ConsequenceChannel } from "@/lib/consequence/evaluate";
import { judgeConsequenceRule } from "@/lib/exposure/consequenceRules";
import { productSchema } from "@/lib/thermal/definitions";
import { limitSetSchema } from "@/lib/exposure/limits";

const H = 3600;
const LN10 = Math.LN10;
const ch = (t_h: number[], v: number[], spans: Array<[number, number]> = []): ConsequenceChannel => ({
  t_s: Float64Array.from(t_h, (t) => t * H),
  value_C: Float64Array.from(v),
  uncertainSpans: spans,
  modelUncertainty_K: 0,
});
const growth = (extra: Partial<GrowthModel> = {}): GrowthModel =>
  growthModelSchema.parse({ id: "g", kind: "growth", organism: "test organism", b_per_C_sqrt_h: 0.02, tmin_C: -1.5, source: "invented for the test", ...extra });
const shelf = (extra: Record<string, unknown>): ShelfLifeModel =>
  shelfLifeModelSchema.parse({ id: "sl", kind: "shelf_life", reference_C: 4, shelf_life_days: 10, ...extra });
/** relative closeness */
const near = (a: number, b: number, rel: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.max(Math.abs(a), Math.abs(b), 1e-300));

describe("growth at constant temperature (closed forms)", () => {
  it("evaluateGrowth without lag gives log10 increase μmax·t/ln 10", () => {
    // μmax = (b·(T − Tmin))² = (0.02·9.5)² = 0.0361 /h at 8 °C (worked by hand from the square-root model)
    const e = evaluateGrowth(growth(), ch([0, 24], [8, 8]), 0, 8);
    near(e.central, (0.0361 * 24) / LN10, 1e-12);
    expect(e.central).toBeCloseTo(0.376273, 6);
  });

  it("evaluateGrowth with lag gives μmax·(t − λ)/ln 10 once well past the lag", () => {
    // Baranyi and Roberts (1994): at constant T, y − y0 = μ·t − h0 + ln(1 + e^(−μt)/q0) with h0 = μ·λ;
    // the last term is below 1e-9 here (μt = 36.1), so y − y0 = μ(t − λ) to that accuracy.
    const e = evaluateGrowth(growth({ lag_h: 100 }), ch([0, 1000], [8, 8]), 0, 8);
    near(e.central, (0.0361 * (1000 - 100)) / LN10, 1e-9);
  });

  it("evaluateGrowth takes q0 from lag_h at the initial temperature (h0 = μmax·λ)", () => {
    // μmax(4 °C) = (0.02·5.5)² = 0.0121 /h; h0 = 0.121; q0 = 1/(e^0.121 − 1) = 7.7745 (worked by hand)
    const e = evaluateGrowth(growth({ lag_h: 10 }), ch([0, 24], [8, 8]), 0, 4);
    expect(e.q0!).toBeCloseTo(1 / Math.expm1(0.121), 10);
    expect(e.q0!).toBeCloseTo(7.77454, 4);
    // A = ln((1 + q0·e^M)/(1 + q0)), M = 0.0361·24 = 0.8664: A = 0.79806, 0.34660 log10 (worked by hand)
    expect(e.central).toBeCloseTo(0.346597, 5);
  });

  it("evaluateGrowth gives no growth when the temperature stays at or below Tmin", () => {
    const e = evaluateGrowth(growth(), ch([0, 10, 20], [-1.5, -5, -3]), 0, 4);
    expect(e.central).toBe(0);
    expect(e.upper).toBe(0);
  });

  it("timeTo inverts the constant-temperature growth: t = L·ln 10/μmax", () => {
    const e = evaluateGrowth(growth(), ch([0, 100], [8, 8]), 0, 8);
    near(e.timeTo(0.5)!, (0.5 * LN10) / 0.0361 * H, 1e-9);
    expect(e.timeTo(5)).toBeNull(); // 100 h give 1.57 log10 only
  });
});

describe("shelf life consumed at constant temperature: t·rate(T)/rate(Tref)", () => {
  it("the square-root dependence: ((T − Tmin)/(Tref − Tmin))²", () => {
    // Tmin = −10 °C, Tref = 4 °C, 2 days at 10 °C: RRS = (20/14)² = 2.0408; 4.0816 days at 4 °C consumed (by hand)
    const e = evaluateShelfLife(shelf({ dependence: "sqrt", tmin_C: -10 }), ch([0, 48], [10, 10]), 0);
    near(e.shelf_life_consumed_days!, 2 * (20 / 14) ** 2, 1e-12);
    near(e.central, 2 * (20 / 14) ** 2 * 10, 1e-12);
    // remaining at the reference (storage defaults to it): 10 − 4.0816 = 5.9184 days
    near(e.remaining_days_at_C!, 10 - 2 * (20 / 14) ** 2, 1e-12);
  });

  it("the Q10 dependence: Q10^((T − Tref)/10)", () => {
    // Q10 = 3, 1 day at 14 °C: RRS = 3, 3 days consumed, 30 % (by hand)
    const e = evaluateShelfLife(shelf({ dependence: "q10", q10: 3 }), ch([0, 24], [14, 14]), 0);
    near(e.shelf_life_consumed_days!, 3, 1e-12);
    near(e.central, 30, 1e-12);
  });

  it("the Arrhenius dependence: exp((Ea/R)(1/Tref − 1/T))", () => {
    // Ea = 80 kJ/mol, 1 day at 8 °C against 4 °C: exp(80000/8.314462618·(1/277.15 − 1/281.15)) = 1.63874 (by hand)
    const e = evaluateShelfLife(shelf({ dependence: "arrhenius", ea_kJ_mol: 80 }), ch([0, 24], [8, 8]), 0);
    near(e.shelf_life_consumed_days!, Math.exp((80000 / R_J_molK) * (1 / 277.15 - 1 / 281.15)), 1e-12);
    expect(e.shelf_life_consumed_days!).toBeCloseTo(1.63874, 4);
  });

  it("the square-root dependence consumes nothing at or below Tmin, and no remaining time is given for storage there", () => {
    const e = evaluateShelfLife(shelf({ dependence: "sqrt", tmin_C: -10, storage_C: -12 }), ch([0, 24, 48], [-10, -15, -11]), 0);
    expect(e.central).toBe(0);
    expect(e.remaining_days_at_C).toBeNull();
  });

  it("remaining shelf life at a storage temperature is what is left divided by that temperature's relative rate", () => {
    // Q10 = 2, 1 day at 14 °C uses 2 days; stored at 9 °C (RRS = 2^0.5) the other 8 days last 8/√2 = 5.657 days (by hand)
    const e = evaluateShelfLife(shelf({ dependence: "q10", q10: 2, storage_C: 9 }), ch([0, 24], [14, 14]), 0);
    near(e.remaining_days_at_C!, 8 / Math.SQRT2, 1e-12);
  });
});

describe("segmentIntegral on a linear temperature ramp", () => {
  it("the square-root model integrates to the cubic k·Δt·(a² + ab + b²)/3", () => {
    // b = 0.03, Tmin = −2 °C, 0 → 10 °C over 10 h: a = 2, b = 12: 0.0009·10·(4 + 24 + 144)/3 = 0.516 (by hand)
    const f = growthRate(growth({ b_per_C_sqrt_h: 0.03, tmin_C: -2 }));
    expect(segmentIntegral(f, 0, 10, 10)).toBeCloseTo(0.516, 12);
  });

  it("a ramp that crosses Tmin counts only the part above it: k·Δt·b³/(3(b − a))", () => {
    // Tmin = −1 °C, −6 → 4 °C over 10 h: above Tmin for the last 5 h, (T + 1) rising 0 → 5:
    // 0.0009·5 h·25/3 = 0.0375 (by hand, as the integral of a square over the last half)
    const f = growthRate(growth({ b_per_C_sqrt_h: 0.03, tmin_C: -1 }));
    expect(segmentIntegral(f, -6, 4, 10)).toBeCloseTo(0.0375, 12);
    expect(segmentIntegral(f, 4, -6, 10)).toBeCloseTo(0.0375, 12);
  });

  it("the Q10 model integrates exactly: Δt·(e^x1 − e^x0)/(x1 − x0)", () => {
    // Q10 = 3, Tref = 4, 4 → 14 °C over 1 day: x = ln(3)·(T − 4)/10 from 0 to ln 3: (3 − 1)/ln 3 = 1.82048 days (by hand)
    const f = relativeRate(shelf({ dependence: "q10", q10: 3 }));
    expect(segmentIntegral(f, 4, 14, 1)).toBeCloseTo(2 / Math.log(3), 13);
  });

  it("the Arrhenius model's adaptive Gauss–Legendre agrees with a fine composite Simpson rule", () => {
    const f = relativeRate(shelf({ dependence: "arrhenius", ea_kJ_mol: 120 }));
    const T0 = -2, T1 = 25, n = 200_000;
    let s = f.value(T0) + f.value(T1);
    for (let i = 1; i < n; i++) s += (i % 2 ? 4 : 2) * f.value(T0 + ((T1 - T0) * i) / n);
    const simpson = s / (3 * n); // over a duration of 1 (Simpson's error here is below 1e-15 relative)
    near(segmentIntegral(f, T0, T1, 1), simpson, 1e-12);
  });

  it("the extended model (with Tmax) is integrated piecewise across Tmin and Tmax, against a fine Simpson rule", () => {
    const f = growthRate(growth({ tmax_C: 45, c_per_C: 0.3 }));
    // a ramp from −10 to 50 °C crosses both ends; Simpson on each smooth piece, 2·10⁵ intervals each
    const simpsonOn = (a: number, b: number) => {
      const n = 200_000;
      let s = f.value(a + 1e-15) + f.value(b - 1e-15);
      for (let i = 1; i < n; i++) s += (i % 2 ? 4 : 2) * f.value(a + ((b - a) * i) / n);
      return ((b - a) / (3 * n)) * s;
    };
    // duration 60 h over 60 K: dt = dT, so the time integral is the integral over T from −1.5 to 45
    near(segmentIntegral(f, -10, 50, 60), simpsonOn(-1.5, 45), 1e-10);
  });
});

describe("Baranyi and Roberts with a maximum population", () => {
  it("lnIncrease matches a fine-step RK4 integration of dq/dt and dy/dt along a changing temperature", () => {
    // y = ln N, m = 1; temperatures rise and fall between 2 and 20 °C over 72 h; q0 = 0.05, y0 = 2 ln 10, ymax = 8 ln 10
    const m = growth({ q0: 0.05, initial_log10: 2, max_log10: 8 });
    const temps = [2, 12, 20, 6, 18, 4, 15];
    const hours = [0, 10, 20, 30, 45, 60, 72];
    const e = evaluateGrowth(m, ch(hours, temps), 0, 4);
    const mu = (t: number) => {
      let k = 0;
      while (k + 1 < hours.length - 1 && t > hours[k + 1]!) k++;
      const T = temps[k]! + ((temps[k + 1]! - temps[k]!) * (t - hours[k]!)) / (hours[k + 1]! - hours[k]!);
      return growthRate(m).value(T);
    };
    const y0 = 2 * LN10, ymax = 8 * LN10;
    const rhs = (t: number, q: number, y: number) => [mu(t) * q, ((mu(t) * q) / (1 + q)) * (1 - Math.exp(y - ymax))] as const;
    let q = 0.05, y = y0;
    const dt = 0.001; // h; RK4 global error O(dt⁴) ≪ 1e-8 here
    for (let t = 0; t < 72 - 1e-9; t += dt) {
      const [k1q, k1y] = rhs(t, q, y);
      const [k2q, k2y] = rhs(t + dt / 2, q + (dt / 2) * k1q, y + (dt / 2) * k1y);
      const [k3q, k3y] = rhs(t + dt / 2, q + (dt / 2) * k2q, y + (dt / 2) * k2y);
      const [k4q, k4y] = rhs(t + dt, q + dt * k3q, y + dt * k3y);
      q += (dt / 6) * (k1q + 2 * k2q + 2 * k3q + k4q);
      y += (dt / 6) * (k1y + 2 * k2y + 2 * k3y + k4y);
    }
    near(e.central, (y - y0) / LN10, 1e-7);
    expect(e.central).toBeGreaterThan(0.5);
  });

  it("lnIncrease levels off at the maximum population", () => {
    // a very large ∫μmax: the increase tends to ymax − y0 (Baranyi and Roberts 1994, stationary phase)
    expect(lnIncrease(500, 0.05, 6 * LN10)).toBeCloseTo(6 * LN10, 10);
    expect(lnIncrease(800, Infinity, 2)).toBeCloseTo(2, 10);
  });

  it("lnIncrease equals Baranyi and Roberts' M + ln(e^−M + e^−h0 − e^(−M−h0)) without a maximum", () => {
    for (const [M, h0] of [[0.3, 1], [3, 2.5], [10, 0.1]] as const) {
      const q0 = 1 / Math.expm1(h0);
      near(lnIncrease(M, q0), M + Math.log(Math.exp(-M) + Math.exp(-h0) - Math.exp(-M - h0)), 1e-12);
      expect(q0FromLag(h0 / 0.5, 0.5)).toBeCloseTo(q0, 12);
    }
  });
});

describe("guard band", () => {
  it("lower ≤ central ≤ upper on random traces, for every model (property-based)", () => {
    const models = [
      growth({ lag_h: 5 }),
      growth({ tmax_C: 30, c_per_C: 0.3, q0: 0.1, initial_log10: 1, max_log10: 4 }),
      shelf({ dependence: "sqrt", tmin_C: -8 }),
      shelf({ dependence: "arrhenius", ea_kJ_mol: 90 }),
      shelf({ dependence: "q10", q10: 2.5 }),
    ];
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -10, max: 40, noNaN: true }), { minLength: 2, maxLength: 40 }),
        fc.double({ min: 0, max: 3, noNaN: true }),
        fc.boolean(),
        (temps, u, gap) => {
          const hours = temps.map((_, i) => i * 0.5);
          const spans: Array<[number, number]> = gap && temps.length > 3 ? [[H * 0.5, H * 1.2]] : [];
          for (const m of models) {
            const e = evaluateConsequence(m, ch(hours, temps, spans), u, 4);
            if (!(e.lower <= e.central && e.central <= e.upper)) return false;
          }
          return true;
        },
      ),
      { numRuns: 200, seed: 16 },
    );
  });

  it("a growth rule passes, is inconclusive and fails at the guard-band boundaries", () => {
    const m = growth();
    const est = (T: number, u: number) => evaluateGrowth(m, ch([0, 24], [T, T]), u, 8);
    const rule = limitSetSchema.parse({ name: "g", rules: [{ id: "lm-half-log", kind: "growth", model: "g", max_log10_increase: 0.5 }] }).rules[0]!;
    if (rule.kind !== "growth") throw new Error("parsed as the wrong kind");
    // 24 h: increase = 24·(0.02·(T + 1.5))²/ln 10; it is 0.5 log10 at T = 1.5 + √(0.5·ln 10/24)/0.02 − 1.5 = 9.451 °C (by hand)
    const Tlimit = Math.sqrt((0.5 * LN10) / 24) / 0.02 - 1.5;
    expect(judgeConsequenceRule(rule, est(Tlimit - 0.6, 0.5), 0).status).toBe("pass");
    expect(judgeConsequenceRule(rule, est(Tlimit - 0.4, 0.5), 0).status).toBe("inconclusive");
    expect(judgeConsequenceRule(rule, est(Tlimit + 0.4, 0.5), 0).status).toBe("inconclusive");
    const failing = judgeConsequenceRule(rule, est(Tlimit + 0.6, 0.5), 0);
    expect(failing.status).toBe("fail");
    expect(failing.reason).toMatch(/fails even in the shipment's favour/);
    // bridged data: a pass becomes inconclusive
    expect(judgeConsequenceRule(rule, est(Tlimit - 0.6, 0.5), 1).status).toBe("inconclusive");
  });
});

describe("definitions", () => {
  const product = { name: "p", mass_kg: 1, properties: { cp_J_kgK: 3500 }, area_m2: 0.05, h_W_m2K: 10, initial_C: 4 };
  it("a product carries both models as the issue writes them", () => {
    const p = productSchema.parse({
      ...product,
      consequences: [
        { id: "sl", kind: "shelf_life", reference_C: 4, shelf_life_days: 10, dependence: "sqrt", tmin_C: -10 },
        { id: "lm", kind: "growth", organism: "free text", b_per_C_sqrt_h: 0.02, tmin_C: -1.5, tmax_C: 45, c_per_C: 0.3, lag_h: 10, initial_log10: 1, max_log10: 8, source: "citation" },
      ],
    });
    expect(p.consequences).toHaveLength(2);
  });

  it("refuses lag_h and q0 together, a lag read where there is no growth, and unknown fields, by name", () => {
    const bad = (c: Record<string, unknown>, initial_C = 4) => productSchema.safeParse({ ...product, initial_C, consequences: [{ id: "lm", kind: "growth", organism: "o", b_per_C_sqrt_h: 0.02, tmin_C: -1.5, source: "s", ...c }] });
    expect(bad({ lag_h: 10, q0: 0.1 }).error!.issues[0]!.message).toBe("give lag_h or q0, not both");
    expect(bad({ lag_h: 10 }, -3).error!.issues[0]!.message).toMatch(/lag_h is read at the initial temperature \(-3 °C\)/);
    expect(bad({ b_per_C: 0.02 }).error!.issues.map((i) => i.message).join()).toMatch(/unknown field 'b_per_C' \(did you mean 'b_per_C_sqrt_h'\?\)/);
    expect(bad({ b_per_C_sqrt_h: 5 }).error!.issues[0]!.message).toBe("b_per_C_sqrt_h must be between 0.001 and 1 1/(°C·√h)");
  });

  it("a limit set takes growth and shelf-life rules beside threshold rules", () => {
    const l = limitSetSchema.parse({
      name: "mixed",
      rules: [
        { id: "core-5", channel: "core", above_C: 5, max_cumulative_min: 120 },
        { id: "lm", kind: "growth", model: "lm", max_log10_increase: 0.5 },
        { id: "sl", kind: "shelf_life", max_consumed_percent: 25 },
      ],
    });
    expect(l.rules.map((r) => r.kind ?? "threshold")).toEqual(["threshold", "growth", "shelf_life"]);
    expect(limitSetSchema.safeParse({ name: "x", rules: [{ id: "x", kind: "cfu" }] }).error!.issues[0]!.message).toBe("rule kind must be growth or shelf_life, or left out for a threshold rule");
  });
});

describe("cumulativeIntegral", () => {
  it("leaves out the parts inside bridged spans exactly", () => {
    // constant 8 °C for 10 h with a span from 2 h to 5 h: 7 h of growth, μ = 0.0361 /h (by hand)
    const c = ch([0, 4, 10], [8, 8, 8]);
    const f = growthRate(growth());
    const cum = cumulativeIntegral(c.t_s, c.value_C, f, H, 0, [[2 * H, 5 * H]]);
    expect(cum[2]!).toBeCloseTo(0.0361 * 7, 12);
  });
});

describe("definitionParameters names growth and shelf-life fields with their units", () => {
  it("reads b, the lag, counts and the shelf life in words and units", async () => {
    const { definitionParameters } = await import("@/lib/review/parameters");
    const rows = definitionParameters({ name: "p", consequences: [{ id: "lm", kind: "growth", b_per_C_sqrt_h: 0.02, lag_h: 10, initial_log10: 1, c_per_C: 0.3 }, { id: "sl", kind: "shelf_life", shelf_life_days: 10, ea_kJ_mol: 80 }] });
    const by = Object.fromEntries(rows.map((r) => [r.path, `${r.label} [${r.unit}]`]));
    expect(by["consequences.1.b_per_C_sqrt_h"]).toBe("consequence 1 (lm): b (square-root model) [1/(°C·√h)]");
    expect(by["consequences.1.lag_h"]).toBe("consequence 1 (lm): lag time [h]");
    expect(by["consequences.1.initial_log10"]).toBe("consequence 1 (lm): initial count [log10 CFU/g]");
    expect(by["consequences.1.c_per_C"]).toBe("consequence 1 (lm): c (extended model) [1/°C]");
    expect(by["consequences.2.shelf_life_days"]).toBe("consequence 2 (sl): shelf life at the reference [days]");
    expect(by["consequences.2.ea_kJ_mol"]).toBe("consequence 2 (sl): activation energy Ea [kJ/mol]");
  });
});

describe("published worked example (relative rate of spoilage)", () => {
  // Seafood Spoilage and Safety Predictor help, "RRS models with user defined temperature characteristics"
  // (DTU Aqua, after Dalgaard 2002): a seafood with a shelf life of 21 days at 5 °C is predicted to keep
  // 47.2 days at 0 °C with the square-root model and Tmin = −10 °C, and 46.4 days with the Arrhenius model and
  // Ea = 100 kJ/mol. Shelf life at T = 21 days / RRS(T): 21 days at 0 °C use 21·RRS(0) days at the reference.
  const sl = (extra: Record<string, unknown>) => shelfLifeModelSchema.parse({ id: "s", kind: "shelf_life", reference_C: 5, shelf_life_days: 21, ...extra });
  it("square root, Tmin −10 °C: 47.2 days at 0 °C", () => {
    const rrs0 = relativeRate(sl({ dependence: "sqrt", tmin_C: -10 })).value(0);
    expect(21 / rrs0).toBeCloseTo(47.2, 1);
    // storing at 0 °C from the start: the remaining life is the whole 47.25 days
    const e = evaluateShelfLife(sl({ dependence: "sqrt", tmin_C: -10, storage_C: 0 }), ch([0, 1e-9], [0, 0]), 0);
    expect(e.remaining_days_at_C!).toBeCloseTo(47.2, 1);
  });
  it("Arrhenius, Ea 100 kJ/mol: 46.4 days at 0 °C", () => {
    const rrs0 = relativeRate(sl({ dependence: "arrhenius", ea_kJ_mol: 100 })).value(0);
    expect(Math.abs(21 / rrs0 - 46.4)).toBeLessThan(0.1);
  });
});

describe("DEPENDENCE_TEMPLATES", () => {
  it("the cold-smoked salmon template reproduces ln(RRS) = 0.089·T (Dalgaard, Murillo and Jørgensen 2004) to 1e-4", async () => {
    const { DEPENDENCE_TEMPLATES } = await import("@/lib/consequence/templates");
    const t = DEPENDENCE_TEMPLATES.find((x) => x.key === "cold-smoked-salmon-exponential")!;
    const f = relativeRate(shelfLifeModelSchema.parse({ id: "s", kind: "shelf_life", reference_C: 0, shelf_life_days: 30, ...t.fields }));
    for (const T of [0, 5, 10, 25]) expect(Math.log(f.value(T))).toBeCloseTo(0.089 * T, 4);
    for (const x of DEPENDENCE_TEMPLATES) expect(x.source.length).toBeGreaterThan(40);
  });
});

describe("cumulativeTimeAbove", () => {
  it("runs up to timeBeyond's cumulative time, interpolating crossings", async () => {
    const { cumulativeTimeAbove, timeBeyond } = await import("@/lib/exposure/timeAbove");
    // triangle 0 → 10 → 0 °C over 1200 s: above 5 °C from 300 s to 900 s (worked by hand)
    const t = Float64Array.from([0, 600, 1200]), v = Float64Array.from([0, 10, 0]);
    expect(Array.from(cumulativeTimeAbove(t, v, 5))).toEqual([0, 300, 600]);
    fc.assert(
      fc.property(fc.array(fc.double({ min: -5, max: 15, noNaN: true }), { minLength: 2, maxLength: 30 }), (vals) => {
        const tt = Float64Array.from(vals, (_, i) => i * 60);
        const c = cumulativeTimeAbove(tt, Float64Array.from(vals), 5);
        return Math.abs(c[c.length - 1]! - timeBeyond(tt, Float64Array.from(vals), 5).cumulative_s) < 1e-9;
      }),
      { numRuns: 200, seed: 5 },
    );
  });
});
