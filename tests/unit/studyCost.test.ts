// The cost of a study, counted before it starts, and the cap one request (or the design page) may start.
import { describe, expect, it } from "vitest";
import { mayConduct, overCapMessage, STUDY_CAP_STEPS, studyCostSteps } from "@/lib/uncertainty/cost";

describe("study cost and cap", () => {
  it("counts trace samples × (1 + Monte Carlo samples), ×100 for conduction (worked by hand)", () => {
    // a 30-day, 1-minute trace: 43,200 samples; 2,000 Monte Carlo samples → 43,200 × 2,001 = 86,443,200 steps
    expect(studyCostSteps(43_200, 2000, false)).toBe(86_443_200);
    expect(studyCostSteps(43_200, 2000, true)).toBe(8_644_320_000);
    expect(studyCostSteps(100, 0, false)).toBe(100);
  });

  it("conduction when chosen, or auto with a shaped product", () => {
    expect(mayConduct("auto", {})).toBe(false);
    expect(mayConduct(undefined, { shape: { kind: "slab" } })).toBe(true);
    expect(mayConduct("lumped", { shape: { kind: "slab" } })).toBe(false);
    expect(mayConduct("conduction-1d", {})).toBe(true);
  });

  it("refuses above the cap, naming it and the command line; at the cap it runs", () => {
    expect(overCapMessage(STUDY_CAP_STEPS, false, "this page runs")).toBeNull();
    const m = overCapMessage(8_644_320_000, true, "this page runs")!;
    expect(m).toBe(
      "this run would take about 8.6e+9 model steps (trace samples × (1 + Monte Carlo samples) × 100 for conduction); this page runs at most 5e+8 per request. " +
        "Use fewer Monte Carlo samples, or run the study from the command line: npm run -s corelag -- review --trace FILE --product P.json --limits L.json --uncertainty U.json",
    );
  });
});
