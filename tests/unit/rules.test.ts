import { describe, it, expect } from "vitest";
import { evaluateRule, overallOutcome, type ChannelSeries, type RuleFinding } from "@/lib/exposure/rules";
import { isThresholdRule, limitSetSchema } from "@/lib/exposure/limits";

const ch = (t: number[], v: number[], uncertainSpans: Array<[number, number]> = []): ChannelSeries => ({
  t_s: Float64Array.from(t),
  value_C: Float64Array.from(v),
  uncertainSpans,
  modelUncertainty_K: 0,
});

// A triangle: 0 °C at 0 s, 10 °C at 600 s, 0 °C at 1200 s. Time above θ is (10 − θ)/10 · 1200 s.
const triangle = ch([0, 600, 1200], [0, 10, 0]);

describe("evaluateRule guard band (ISO 14253-1 style decision rule)", () => {
  const rule = { id: "r", channel: "core" as const, above_C: 5, max_cumulative_min: 10 };

  it("evaluateRule passes when the limit holds with the threshold moved against the shipment", () => {
    // nominal: 600 s = 10 min (exactly the allowance, within it); u = 0 → pass
    expect(evaluateRule(rule, triangle, 0).status).toBe("pass");
  });

  it("evaluateRule is inconclusive inside the guard band", () => {
    // u = 0.5 K: strict threshold 4.5 °C → 660 s = 11 min > 10 (not a pass);
    // lenient threshold 5.5 °C → 540 s = 9 min ≤ 10 (not a fail)
    const f = evaluateRule(rule, triangle, 0.5);
    expect(f.status).toBe("inconclusive");
    expect(f.cumulative_s).toBe(600);
  });

  it("evaluateRule fails only when the limit is exceeded with the threshold moved in the shipment's favour", () => {
    const tight = { ...rule, max_cumulative_min: 8.9 };
    // lenient 5.5 °C → 9 min > 8.9 → fail
    expect(evaluateRule(tight, triangle, 0.5).status).toBe("fail");
    // with 9.1 min allowed, 9 min lenient does not fail, 11 min strict does not pass
    expect(evaluateRule({ ...rule, max_cumulative_min: 9.1 }, triangle, 0.5).status).toBe("inconclusive");
  });

  it("evaluateRule applies the guard band to a peak limit", () => {
    const peak = { id: "p", channel: "core" as const, above_C: 8, max_peak_C: 10.2 };
    expect(evaluateRule(peak, triangle, 0).status).toBe("pass");
    expect(evaluateRule(peak, triangle, 0.5).status).toBe("inconclusive"); // 10 + 0.5 > 10.2 ≥ 10 − 0.5
    expect(evaluateRule({ ...peak, max_peak_C: 9.4 }, triangle, 0.5).status).toBe("fail"); // 10 − 0.5 > 9.4
  });

  it("evaluateRule with no allowance fails on any time beyond the threshold", () => {
    const f = evaluateRule({ id: "z", channel: "air", above_C: 9 }, triangle, 0);
    expect(f.status).toBe("fail");
    expect(f.reason).toMatch(/none allowed/);
  });

  it("evaluateRule is at best inconclusive when the channel crosses bridged data", () => {
    const f = evaluateRule(rule, ch([0, 600, 1200], [0, 10, 0], [[0, 600]]), 0);
    expect(f.status).toBe("inconclusive");
    expect(f.reason).toMatch(/gap/);
  });

  it("evaluateRule still fails on measured data outside a gap", () => {
    // Above 5 °C from 300 s to 900 s; a gap covers 0–100 s only: the 10 min of measured excess stands.
    const f = evaluateRule({ ...rule, max_cumulative_min: 5 }, ch([0, 600, 1200], [0, 10, 0], [[0, 100]]), 0);
    expect(f.status).toBe("fail");
  });
});

describe("overallOutcome", () => {
  const f = (status: RuleFinding["status"]) => ({ status }) as RuleFinding;
  it("overallOutcome is accept only when every rule passes, reject when any fails, hold otherwise", () => {
    expect(overallOutcome([f("pass"), f("pass")])).toBe("accept");
    expect(overallOutcome([f("pass"), f("inconclusive")])).toBe("hold");
    expect(overallOutcome([f("inconclusive"), f("fail")])).toBe("reject");
  });
});

describe("limitSetSchema", () => {
  it("limitSetSchema refuses a rule with both above_C and below_C, naming the rule", () => {
    const r = limitSetSchema.safeParse({ name: "x", rules: [{ id: "a", channel: "air", above_C: 5, below_C: 0 }] });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0]!.path).toEqual(["rules", 0, "above_C"]);
  });
  it("limitSetSchema refuses duplicate rule ids", () => {
    const r = limitSetSchema.safeParse({ rules: [{ id: "a", channel: "air", above_C: 5 }, { id: "a", channel: "core", above_C: 5 }] });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0]!.message).toMatch(/unique/);
  });
});

describe("limit templates", () => {
  it("every template is a valid limit set that names its source and defers to local rules", async () => {
    const { LIMIT_TEMPLATES } = await import("@/lib/exposure/templates");
    for (const t of LIMIT_TEMPLATES) {
      expect(limitSetSchema.safeParse(t.limits).success).toBe(true);
      expect(t.source).toMatch(/§|Directive|regulations/);
      expect(t.source).toMatch(/Local regulations and your own food-safety plan govern/);
    }
  });

  it("the cooling template passes a product that cools from 57 °C to 21 °C in 110 min and to 5 °C in 350 min", async () => {
    const { LIMIT_TEMPLATES } = await import("@/lib/exposure/templates");
    const cooling = { rules: LIMIT_TEMPLATES.find((t) => t.key === "cooling-cooked-food")!.limits.rules.filter(isThresholdRule) };
    // piecewise-linear core: 57 → 21 °C over 110 min, then 21 → 5 °C by 350 min, then 3 °C
    const c = ch([0, 110 * 60, 350 * 60, 400 * 60], [57, 21, 5, 3]);
    const findings = cooling.rules.map((r) => evaluateRule(r, c, 0));
    expect(findings.map((f) => f.status)).toEqual(["pass", "pass"]);
    // 10 minutes slower to 21 °C fails the first rule
    const slow = ch([0, 130 * 60, 350 * 60, 400 * 60], [57, 21, 5, 3]);
    expect(evaluateRule(cooling.rules[0]!, slow, 0).status).toBe("fail");
  });
});

describe("evaluateRule states a peak and the guard band separately", () => {
  // A triangle peaking at 7.65 °C; rule: peak at most 8 °C; sensor accuracy 0.5 K.
  // 7.65 + 0.5 > 8 ≥ 7.65 − 0.5 → inconclusive (worked by hand from the ISO 14253-1 style rule).
  const low = ch([0, 600, 1200], [0, 7.65, 0]);
  const peak = { id: "core-peak-8C", channel: "core" as const, above_C: 8, max_peak_C: 8 };

  it("evaluateRule gives the measured peak, not the peak plus the guard band", () => {
    const f = evaluateRule(peak, low, 0.5);
    expect(f.status).toBe("inconclusive");
    expect(f.reason).toContain("peak 7.65 °C is within the 0.5 K guard band of the 8 °C limit");
    expect(f.reason).not.toMatch(/8\.15|8\.2 °C/);
  });

  it("evaluateRule's failing peak names the measured value and the guard band", () => {
    // the triangle peaks at 10 °C; 10 − 0.5 > 9.4 → fail
    const f = evaluateRule({ ...peak, max_peak_C: 9.4 }, triangle, 0.5);
    expect(f.status).toBe("fail");
    expect(f.reason).toContain("peak 10 °C is beyond the 9.4 °C limit by more than the 0.5 K guard band");
  });
});
