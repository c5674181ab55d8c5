import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { isoUtc } from "@/lib/cli/seriesCsv";

describe("isoUtc", () => {
  test("isoUtc(t_s) equals Date#toISOString for any time 1990–2100 to the millisecond, in any order", () => {
    const day = { start_ms: NaN, text: "" };
    fc.assert(
      fc.property(fc.integer({ min: Date.UTC(1990, 0, 1), max: Date.UTC(2100, 0, 1) }), (ms) => {
        expect(isoUtc(ms / 1000, day)).toBe(new Date(ms).toISOString());
      }),
      { numRuns: 5000 },
    );
  });

  test("isoUtc rounds to the millisecond like the importer's epoch seconds (a day boundary included)", () => {
    const day = { start_ms: NaN, text: "" };
    expect(isoUtc(Date.UTC(2026, 5, 16, 23, 59, 59, 999) / 1000 + 0.0004, day)).toBe("2026-06-16T23:59:59.999Z");
    expect(isoUtc(Date.UTC(2026, 5, 16, 23, 59, 59, 999) / 1000 + 0.0006, day)).toBe("2026-06-17T00:00:00.000Z");
  });
});
