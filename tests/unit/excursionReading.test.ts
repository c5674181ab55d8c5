import { describe, it, expect } from "vitest";
import { runReview } from "@/lib/review/runReview";

// Air at 3 °C for 6 h with a warm spell: 7 °C from minute 60 to 140 and 10 °C from minute 100 to 110,
// sampled each minute and linear in between. Above 5 °C the air crosses at 59.5 and 140.5 min: 81 min
// (worked by hand). Above 8 °C it is out for about 11 min only.
const t = Float64Array.from({ length: 361 }, (_, i) => i * 60);
const air = Float64Array.from(t, (_, i) => (i >= 100 && i <= 110 ? 10 : i >= 60 && i <= 140 ? 7 : 3));
const product = { name: "tray", mass_kg: 0.45, properties: { cp_J_kgK: 3600 }, area_m2: 0.062, h_W_m2K: 2.5, initial_C: 3 };
const limits = {
  name: "l",
  rules: [
    { id: "core-above-5C", channel: "core" as const, above_C: 5, max_cumulative_min: 120 },
    { id: "air-above-8C", channel: "air" as const, above_C: 8, max_cumulative_min: 180 },
  ],
};

describe("runReview's screening sentence", () => {
  it("runReview names the threshold the longest air excursion is measured against", () => {
    const r = runReview({ series: { t_s: t, air_C: air }, product, limits }).result;
    expect(r.screening.excursion_reading).toContain("a longest air excursion of 81 min above 5 °C, the threshold of rule core-above-5C");
    // the air rule's own table lists the air beyond 8 °C: a different, shorter excursion
    const airRule = r.rules.find((x) => x.id === "air-above-8C")!;
    expect(airRule.excursions).toHaveLength(1);
    expect(airRule.excursions[0]!.duration_min).toBeLessThan(12);
  });

  it("runReview lists every rule that shares the threshold", () => {
    const shared = { name: "s", rules: [...limits.rules, { id: "core-peak", channel: "core" as const, above_C: 5, max_peak_C: 9 }] };
    const r = runReview({ series: { t_s: t, air_C: air }, product, limits: shared }).result;
    expect(r.screening.excursion_reading).toContain("81 min above 5 °C, the threshold of rules core-above-5C, core-peak");
  });
});
