import { describe, it, expect } from "vitest";
import { timeBeyond } from "@/lib/exposure/timeAbove";
import { expectClose } from "../helpers/numeric";

const f = (a: number[]) => Float64Array.from(a);

// Hand-built traces: every expected value follows from linear interpolation between samples.
describe("timeBeyond", () => {
  it("timeBeyond(series, 5) interpolates both crossings inside their intervals", () => {
    // 4 → 6 crosses 5 half-way (t = 30 s); 6 → 4 crosses half-way (t = 150 s).
    const r = timeBeyond(f([0, 60, 120, 180]), f([4, 6, 6, 4]), 5);
    expect(r.cumulative_s).toBe(120);
    expect(r.excursions).toHaveLength(1);
    expect(r.excursions[0]).toMatchObject({ start_s: 30, end_s: 150, duration_s: 120, peak_C: 6 });
    // area above 5: triangle 0.5·30·1 + rectangle 60·1 + triangle 0.5·30·1 = 90 K·s
    expectClose(r.excursions[0]!.area_Ks, 90, { abs: 1e-12 });
  });

  it("timeBeyond counts a trace that starts above the threshold from its first sample", () => {
    const r = timeBeyond(f([0, 100, 200]), f([9, 7, 3]), 5);
    // 7 → 3 crosses 5 half-way: t = 150 s
    expect(r.excursions[0]).toMatchObject({ start_s: 0, end_s: 150, peak_C: 9 });
    expect(r.cumulative_s).toBe(150);
  });

  it("timeBeyond closes an excursion still open at the last sample", () => {
    const r = timeBeyond(f([0, 100, 200]), f([3, 4, 8]), 5);
    // 4 → 8 crosses 5 at a quarter of the interval: t = 125 s
    expect(r.excursions[0]).toMatchObject({ start_s: 125, end_s: 200, duration_s: 75, peak_C: 8 });
  });

  it("timeBeyond adds no time for a value that only touches the threshold", () => {
    const r = timeBeyond(f([0, 60, 120, 180]), f([3, 5, 3, 5]), 5);
    expect(r.cumulative_s).toBe(0);
    expect(r.excursions).toEqual([]);
  });

  it("timeBeyond sums separate episodes and reports the longest", () => {
    const r = timeBeyond(f([0, 60, 120, 180, 240, 300]), f([6, 4, 6, 6, 6, 4]), 5);
    // episode 1: 0 → 30 s; episode 2: 90 → 270 s
    expect(r.excursions.map((e) => [e.start_s, e.end_s])).toEqual([[0, 30], [90, 270]]);
    expect(r.cumulative_s).toBe(210);
    expect(r.longest_s).toBe(180);
  });

  it("timeBeyond(series, -18, 'below') measures time below a threshold with the lowest value as peak", () => {
    const r = timeBeyond(f([0, 60, 120]), f([-16, -20, -16]), -18, "below");
    expect(r.cumulative_s).toBe(60); // crossings at 30 s and 90 s
    expect(r.excursions[0]!.peak_C).toBe(-20);
  });
});
