import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { medianInterval_s, selectKth } from "@/lib/trace/series";

// The reference is the definition itself: sort, then take the middle (or the mean of the two middles).
function sortedMedian(t: number[]): number {
  const d = t.slice(1).map((x, i) => x - t[i]!).sort((a, b) => a - b);
  const m = d.length >> 1;
  return d.length % 2 ? d[m]! : (d[m - 1]! + d[m]!) / 2;
}

describe("medianInterval_s", () => {
  test("medianInterval_s equals the sorted-list median for any increasing times, odd and even counts", () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 900 }), { minLength: 1, maxLength: 400 }), (steps) => {
        const t = [0];
        for (const s of steps) t.push(t.at(-1)! + s);
        expect(medianInterval_s(Float64Array.from(t))).toBe(sortedMedian(t));
      }),
      { numRuns: 2000 },
    );
  });

  test("medianInterval_s of one-minute readings with one long pause is 60 s", () => {
    const t = Float64Array.from({ length: 1001 }, (_, i) => i * 60 + (i > 500 ? 7200 : 0));
    expect(medianInterval_s(t)).toBe(60);
  });

  test("selectKth(a, k) puts the k-th smallest at k with nothing larger before it", () => {
    fc.assert(
      fc.property(fc.array(fc.double({ noNaN: true, min: -1e6, max: 1e6 }), { minLength: 1, maxLength: 300 }), fc.nat(), (xs, n) => {
        const a = Float64Array.from(xs);
        const k = n % a.length;
        const v = selectKth(a, k);
        expect(v).toBe([...xs].sort((x, y) => x - y)[k]);
        for (let i = 0; i < k; i++) expect(a[i]!).toBeLessThanOrEqual(v);
        for (let i = k + 1; i < a.length; i++) expect(a[i]!).toBeGreaterThanOrEqual(v);
      }),
      { numRuns: 2000 },
    );
  });
});
