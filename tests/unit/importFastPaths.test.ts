// The import's per-row fast paths must give exactly what the general paths give: the rows Papa Parse
// hands over, the wall-clock ms of parseWallClock + wallAsUtcMs, the double Number() reads. Each is
// compared with the general path itself (the reference), on hand-picked edge cases and generated input.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { forEachRow, papaRows } from "@/lib/trace/rows";
import { isoWallMs, parseWallClock, wallAsUtcMs, ZoneResolver, YEAR_RANGE } from "@/lib/trace/timestamps";
import { plainReading } from "@/lib/trace/values";

type Row = { cells: string[]; cursor: number; problem: string | undefined };
const collect = (run: (text: string, d: string, on: (c: string[], cur: number, p: string | undefined) => void) => void, text: string, d = ",") => {
  const rows: Row[] = [];
  run(text, d, (cells, cursor, problem) => rows.push({ cells, cursor, problem }));
  return rows;
};

describe("forEachRow gives Papa Parse's rows", () => {
  const cases = [
    "a,b\n1,2\n3,4",
    "a,b\n1,2\n3,4\n",
    "a,b\r\n1,2\r\n3,4\r\n",
    "a,b\r1,2\r3,4\r",
    "a,b\r\n1,2\n3,4\r\n5,6\n", // mixed: Papa picks one break from its first megabyte
    "a,b\n1,2\r\n3,4\r\n5,6\r\n7,8\r\n",
    "\ufeffa,b\n1,2\n",
    "\ufeff\ufeffa,b\n1,2\n",
    "a;b\n\n1;2\n\n\n",
    "\n\n",
    "x",
    "a,b\n\"1,5\",2\n3,4\n", // quoted: both go through Papa
    "a,b\n\"1,2\n3,4\n", // an unclosed quote: Papa's complaint is passed on
  ];
  it.each(cases.map((c) => [JSON.stringify(c), c]))("%s", (_name, text) => {
    const d = text.includes(";") ? ";" : ",";
    expect(collect(forEachRow, text, d)).toEqual(collect(papaRows, text, d));
  });

  it("on generated quote-free text with any mix of line breaks, delimiters and blank cells", () => {
    const piece = fc.constantFrom("1", "22", "-3.5", "", " ", ",", ";", "\t", "\n", "\r", "\r\n", "a", "°C", "\ufeff");
    fc.assert(
      fc.property(fc.array(piece, { maxLength: 60 }), fc.constantFrom(",", ";", "\t", "|"), (parts, d) => {
        const text = parts.join("");
        expect(collect(forEachRow, text, d)).toEqual(collect(papaRows, text, d));
      }),
      { numRuns: 500 },
    );
  });

  it("a throw from the handler stops the pass and reaches the caller", () => {
    let seen = 0;
    expect(() =>
      forEachRow("a\n1\n2\n3\n", ",", () => {
        if (++seen === 2) throw new Error("stop");
      }),
    ).toThrow("stop");
    expect(seen).toBe(2);
  });
});

describe("isoWallMs equals the general date-time path", () => {
  const general = (s: string) => {
    const w = parseWallClock(s, "dmy");
    return w && w.y >= YEAR_RANGE.min && w.y <= YEAR_RANGE.max ? wallAsUtcMs(w) : Number.NaN;
  };

  it("on every day from 1990 to 2100 (leap days included)", () => {
    for (let ms = Date.UTC(1990, 0, 1); ms <= Date.UTC(2100, 11, 31); ms += 86_400_000) {
      const s = new Date(ms + 45_296_789).toISOString(); // 12:34:56.789 each day
      expect(isoWallMs(s)).toBe(general(s));
      expect(isoWallMs(s.slice(0, 19).replace("T", " "))).toBe(general(s.slice(0, 19).replace("T", " ")));
    }
  });

  it("on generated text near the layout: NaN exactly where a fallback is needed, else the same ms", () => {
    const digit = fc.constantFrom(..."0123456789");
    const two = fc.tuple(digit, digit).map(([a, b]) => a + b);
    const text = fc
      .tuple(fc.constantFrom("19", "20", "21", "00", "99"), two, two, two, fc.constantFrom("T", " ", "t"), two, two, two, fc.constantFrom("", ".", ".5", ".25", ".125", ".1234", ".9999", "Z", ".5Z", "+01:00", " Z"))
      .map(([c, y, mo, d, sep, h, mi, s, tail]) => `${c}${y}-${mo}-${d}${sep}${h}:${mi}:${s}${tail}`);
    fc.assert(
      fc.property(text, (s) => {
        const fast = isoWallMs(s);
        const w = parseWallClock(s, "dmy");
        // the fast path reads only its own layout; where it answers, the general path agrees
        if (!Number.isNaN(fast)) expect(fast).toBe(general(s));
        // and it answers wherever the general path reads that layout without an offset other than Z
        if (w && /^\d{4}-\d\d-\d\d[T ]\d\d:\d\d:\d\d(\.\d+)?Z?$/.test(s) && w.y >= YEAR_RANGE.min && w.y <= YEAR_RANGE.max) expect(fast).toBe(wallAsUtcMs(w));
      }),
      { numRuns: 5000 },
    );
  });

  it("UTC needs no zone data and places wall times as they are", () => {
    const utc = new ZoneResolver("UTC");
    const wall = Date.UTC(2026, 2, 29, 2, 30);
    expect(utc.wallToEpochMs(wall, undefined, -Infinity)).toBe(wall);
    expect(utc.wallToEpochMs(wall, 60, -Infinity)).toBe(wall - 3_600_000);
    // Europe/Berlin still goes through the zone data: 02:30 on 2026-03-29 is skipped, read at +01:00
    const berlin = new ZoneResolver("Europe/Berlin");
    expect(berlin.wallToEpochMs(wall, undefined, -Infinity)).toBe(wall - 3_600_000);
    expect(berlin.skipped).toBe(1);
  });
});

describe("plainReading equals Number() on plain readings", () => {
  it("on hand-picked cells", () => {
    for (const c of ["4.25", "-18.3", "0.1", "-0.000", "9999.999999", "1234.5", "0.3", "73.12"]) expect(Object.is(plainReading(c), Number(c))).toBe(true);
    for (const c of ["4", "4.", ".5", "12345.6", "1.1234567", "+1.5", " 1.5", "1.5 ", "1,5", "1e3", "--1.5", "-", ""]) expect(plainReading(c)).toBeNaN();
  });

  it("on generated cells of the plain layout (every digit count)", () => {
    const digits = (min: number, max: number) => fc.array(fc.constantFrom(..."0123456789"), { minLength: min, maxLength: max }).map((a) => a.join(""));
    fc.assert(
      fc.property(fc.boolean(), digits(1, 4), digits(1, 6), (neg, i, f) => {
        const c = `${neg ? "-" : ""}${i}.${f}`;
        expect(Object.is(plainReading(c), Number(c))).toBe(true);
      }),
      { numRuns: 20000 },
    );
  });
});
