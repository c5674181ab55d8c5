import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { DateTime } from "luxon";
import { importCsv, type ImportOptions } from "@/lib/trace";
import { utf16 } from "../helpers/encode";

// Property: a trace written out in any supported dialect reads back to the same series.
const UNITS = { C: (c: number) => c, F: (c: number) => (c * 9) / 5 + 32, K: (c: number) => c + 273.15 } as const;

const dialect = fc.record({
  delimiter: fc.constantFrom(",", ";", "\t", "|"),
  decimalComma: fc.boolean(),
  unit: fc.constantFrom("C", "F", "K") as fc.Arbitrary<"C" | "F" | "K">,
  time: fc.constantFrom("iso-z", "local-berlin", "dmy-berlin", "unix-s", "mdy-utc"),
  encoding: fc.constantFrom("utf-8", "utf-8-bom", "utf-16le", "utf-16be"),
  crlf: fc.boolean(),
  metadata: fc.boolean(),
});

const series = fc
  // steps under an hour: then the order rule places every time of the repeated autumn hour correctly
  // (with longer steps a wall time in that hour is truly ambiguous, and no rule can tell)
  .array(fc.record({ step: fc.integer({ min: 1, max: 59 }), value: fc.integer({ min: -4000, max: 6000 }), missing: fc.boolean() }), { minLength: 2, maxLength: 60 })
  .map((rows) => {
    let t = Date.UTC(2026, 9, 24, 20) / 1000; // spans the end of summer time in Berlin on some draws
    return rows.map((r, i) => {
      t += r.step * 60;
      // keep the ends valid (they cannot be bridged) and values to 2 decimals
      return { t, c: r.missing && i > 0 && i < rows.length - 1 ? Number.NaN : r.value / 100 };
    });
  })
  .filter((rows) => rows.some((r, i) => i > 0 && !Number.isNaN(r.c)));

function encode(text: string, encoding: string): Uint8Array {
  if (encoding === "utf-8") return new TextEncoder().encode(text);
  if (encoding === "utf-8-bom") return new Uint8Array([0xef, 0xbb, 0xbf, ...new TextEncoder().encode(text)]);
  return utf16(text, encoding === "utf-16be");
}

describe("import round trip (fast-check)", () => {
  it("a trace written in any supported dialect reads back to the same series", () => {
    fc.assert(
      fc.property(series, dialect, (rows, d) => {
        const decimal = d.decimalComma && d.delimiter !== "," ? "," : ".";
        const zone = d.time.includes("berlin") ? "Europe/Berlin" : "UTC";
        const fmtTime = (t: number) => {
          const dt = DateTime.fromSeconds(t, { zone });
          if (d.time === "iso-z") return new Date(t * 1000).toISOString();
          if (d.time === "unix-s") return String(t);
          if (d.time === "local-berlin") return dt.toFormat("yyyy-MM-dd HH:mm:ss");
          if (d.time === "dmy-berlin") return dt.toFormat("dd.MM.yyyy HH:mm");
          return dt.toFormat("MM/dd/yyyy HH:mm");
        };
        const unitLabel = d.unit === "K" ? "(K)" : `(°${d.unit})`;
        const lines = [...(d.metadata ? ["Serial: RT-1", "Notes: round trip"] : []), `Time${d.delimiter}Air ${unitLabel}`];
        for (const r of rows) {
          const v = Number.isNaN(r.c) ? "" : UNITS[d.unit](r.c).toFixed(6);
          lines.push(`${fmtTime(r.t)}${d.delimiter}${decimal === "," ? v.replace(".", ",") : v}`);
        }
        const text = lines.join(d.crlf ? "\r\n" : "\n") + (d.crlf ? "\r\n" : "\n");
        const opts: ImportOptions = { timeZone: zone };
        if (d.time === "mdy-utc" || d.time === "dmy-berlin") opts.dateOrder = d.time === "mdy-utc" ? "mdy" : "dmy";
        const r = importCsv(encode(text, d.encoding), opts);
        expect(Array.from(r.series.t_s)).toEqual(rows.map((x) => x.t));
        rows.forEach((x, i) => {
          const got = r.series.air_C[i]!;
          if (Number.isNaN(x.c)) expect(got).toBeNaN();
          else expect(Math.abs(got - x.c)).toBeLessThan(1e-6);
        });
      }),
      { numRuns: 300 },
    );
  });
});
