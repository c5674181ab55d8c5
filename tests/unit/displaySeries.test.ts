import { describe, it, expect } from "vitest";
import { displaySeries } from "@/lib/display/series";
import { mulberry32 } from "@/lib/uncertainty/random";

// What the review page sends the browser for a long trace. The 200 kB budget is from issue 9 (a 30-day,
// 1-minute review sent about 1.5 MB of JSON).
describe("displaySeries", () => {
  const n = 30 * 24 * 60; // 30 days of 1-minute samples
  const rand = mulberry32(7);
  const t_s = Float64Array.from({ length: n }, (_, i) => 1_780_000_000 + 60 * i);
  const air = Float64Array.from({ length: n }, (_, i) => 4 + 2 * Math.sin((2 * Math.PI * i) / 1440) + (rand() - 0.5) * 0.8);
  air[20_000] = 14.2; // a one-minute spike
  const core = Float64Array.from({ length: n }, (_, i) => 4 + 1.2 * Math.sin((2 * Math.PI * (i - 120)) / 1440));
  const p05 = core.map((x) => x - 0.4), p95 = core.map((x) => x + 0.4);

  const d = displaySeries({ t_s, channels: { air, core, p05, p95 }, thresholds: [{ value_C: 8, direction: "above", channels: ["air", "core", "p05", "p95"] }] });

  it("a 30-day 1-minute review with a Monte Carlo band ships under 200 kB of series", () => {
    const bytes = Buffer.byteLength(JSON.stringify(d));
    expect(bytes).toBeLessThan(200_000);
    expect(d.times_ms.length).toBeLessThan(n / 10);
  });

  it("keeps the one-minute spike and the global extremes of every channel", () => {
    const i = d.times_ms.indexOf(Math.round(t_s[20_000]! * 1000));
    expect(i).toBeGreaterThanOrEqual(0);
    expect(d.channels.air![i]).toBe(14.2);
    for (const [k, v] of Object.entries({ air, core, p05, p95 })) {
      expect(Math.max(...d.channels[k]!)).toBeCloseTo(Math.max(...v), 3);
      expect(Math.min(...d.channels[k]!)).toBeCloseTo(Math.min(...v), 3);
    }
  });

  it("leaves out absent channels and keeps every channel on the one time axis", () => {
    const e = displaySeries({ t_s: [0, 60, 120], channels: { air: [1, 2, 3], probe: undefined } });
    expect(e).toEqual({ times_ms: [0, 60_000, 120_000], channels: { air: [1, 2, 3] } });
  });
});
