import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { decimateIndices, pick } from "@/lib/display/decimate";

// Properties of display decimation (lib/display/decimate.ts); the expected behaviour is the method's
// definition (min/max per time bucket plus the extreme of every run beyond a threshold), checked on random series.

const series = fc
  .integer({ min: 1, max: 600 })
  .chain((n) =>
    fc.record({
      t: fc.array(fc.integer({ min: 1, max: 300 }), { minLength: n, maxLength: n }).map((steps) => {
        let acc = 1_780_000_000;
        return steps.map((s) => (acc += s));
      }),
      a: fc.array(fc.oneof({ weight: 20, arbitrary: fc.double({ min: -30, max: 40, noNaN: true }) }, { weight: 1, arbitrary: fc.constant(Number.NaN) }), { minLength: n, maxLength: n }),
      b: fc.array(fc.double({ min: -30, max: 40, noNaN: true }), { minLength: n, maxLength: n }),
      buckets: fc.integer({ min: 1, max: 80 }),
      threshold: fc.double({ min: -30, max: 40, noNaN: true }),
      direction: fc.constantFrom("above" as const, "below" as const),
    }),
  );

/** Maximal runs [start, end] of finite samples strictly beyond the threshold. */
function runsBeyond(v: number[], th: number, dir: "above" | "below"): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  let start = -1;
  v.forEach((x, i) => {
    const beyond = Number.isFinite(x) && (dir === "above" ? x > th : x < th);
    if (beyond && start < 0) start = i;
    if (!beyond && start >= 0) {
      out.push([start, i - 1]);
      start = -1;
    }
  });
  if (start >= 0) out.push([start, v.length - 1]);
  return out;
}

describe("decimateIndices", () => {
  it("keeps the global minimum and maximum of every channel, the first and the last sample, in ascending order", () => {
    fc.assert(
      fc.property(series, ({ t, a, b, buckets }) => {
        const idx = decimateIndices(t, [a, b], { buckets });
        expect(idx[0]).toBe(0);
        expect(idx[idx.length - 1]).toBe(t.length - 1);
        for (let k = 1; k < idx.length; k++) expect(idx[k]!).toBeGreaterThan(idx[k - 1]!);
        for (const v of [a, b]) {
          const finite = v.filter(Number.isFinite);
          if (finite.length === 0) continue;
          const kept = pick(v, idx).filter(Number.isFinite);
          expect(Math.max(...kept)).toBe(Math.max(...finite));
          expect(Math.min(...kept)).toBe(Math.min(...finite));
        }
      }),
      { numRuns: 300 },
    );
  });

  it("keeps, for every run beyond a threshold, that run's most extreme sample", () => {
    fc.assert(
      fc.property(series, ({ t, a, b, buckets, threshold, direction }) => {
        const idx = decimateIndices(t, [a, b], { buckets, thresholds: [{ value_C: threshold, direction }] });
        const kept = new Set(idx);
        for (const v of [a, b]) {
          for (const [s, e] of runsBeyond(v, threshold, direction)) {
            const run = v.slice(s, e + 1);
            const extreme = direction === "above" ? Math.max(...run) : Math.min(...run);
            const survivors = idx.filter((i) => i >= s && i <= e && kept.has(i)).map((i) => v[i]!);
            expect(survivors).toContain(extreme);
          }
        }
      }),
      { numRuns: 300 },
    );
  });

  it("keeps the first sample of every run of missing values, so a break in a line stays a break", () => {
    fc.assert(
      fc.property(series, ({ t, a, buckets }) => {
        const idx = new Set(decimateIndices(t, [a], { buckets }));
        a.forEach((x, i) => {
          if (Number.isNaN(x) && (i === 0 || !Number.isNaN(a[i - 1]!))) expect(idx.has(i)).toBe(true);
        });
      }),
      { numRuns: 200 },
    );
  });

  it("a single one-sample spike in 43,200 one-minute samples survives 400 buckets", () => {
    const n = 43_200;
    const t = Array.from({ length: n }, (_, i) => i * 60);
    const v = Array.from({ length: n }, (_, i) => 4 + 0.5 * Math.sin(i / 300));
    v[12_345] = 9.1; // one reading beyond 8 °C
    const idx = decimateIndices(t, [v], { buckets: 400, thresholds: [{ value_C: 8, direction: "above" }] });
    expect(idx).toContain(12_345);
    // at most first + last + two per bucket + the one excursion peak
    expect(idx.length).toBeLessThanOrEqual(2 + 2 * 400 + 1);
  });

  it("returns every index when the series is short enough to draw whole", () => {
    expect(decimateIndices([0, 1, 2, 3], [[1, 5, 2, 4]], { buckets: 10 })).toEqual([0, 1, 2, 3]);
  });
});
