import { describe, it, expect } from "vitest";
import { readFileSync } from "node:fs";
import path from "node:path";
import { DUPLICATE_ROWS_ALLOWED, importCsv, importOptionsSchema, TraceImportError } from "@/lib/trace";
import { expectClose } from "../helpers/numeric";

const enc = (s: string) => new TextEncoder().encode(s);
const refused = (text: string, opts = {}) => {
  try {
    importCsv(enc(text), opts);
  } catch (e) {
    expect(e).toBeInstanceOf(TraceImportError);
    return (e as Error).message;
  }
  throw new Error("expected the import to be refused");
};

describe("importCsv", () => {
  it("importCsv reads the demo export: metadata lines skipped, offsets honoured, °C from the header", () => {
    const bytes = readFileSync(path.join(__dirname, "../../public/demo/route7-tote3.csv"));
    const r = importCsv(bytes);
    expect(r.settings).toMatchObject({ headerRow: 5, timeColumn: "Timestamp", airColumn: "Air temperature (°C)", airUnit: "C", delimiter: ",", encoding: "utf-8", timeFormat: "datetime" });
    expect(r.series.t_s.length).toBe(361);
    // first row: 2026-06-16T05:00:00+02:00 = 03:00 UTC
    expect(r.series.t_s[0]).toBe(Date.UTC(2026, 5, 16, 3) / 1000);
    expect(r.series.t_s[1]! - r.series.t_s[0]!).toBe(120);
    expect(r.warnings).toEqual([]);
  });

  it("importCsv converts °F from the header to °C exactly", () => {
    const r = importCsv(enc("time,temp (°F)\n2026-01-01T00:00:00Z,41\n2026-01-01T00:05:00Z,32\n"));
    expect(r.settings.airUnit).toBe("F");
    expectClose(r.series.air_C[0]!, 5, { abs: 1e-12 });
    expect(r.series.air_C[1]).toBe(0);
  });

  it("importCsv reads local times in the chosen IANA zone", () => {
    const r = importCsv(enc("time;air\n2026-07-01 12:00:00;4.0\n2026-07-01 12:10:00;4.5\n"), { timeZone: "Europe/Berlin" });
    expect(r.settings.delimiter).toBe(";");
    expect(r.series.t_s[0]).toBe(Date.UTC(2026, 6, 1, 10) / 1000); // CEST = UTC+2
  });

  it("importCsv refuses a text cell in the temperature column, naming row and column", () => {
    const msg = refused("Time,Temp\n2026-01-01T00:00:00Z,4.1\n2026-01-01T00:01:00Z,12,4,1\n");
    expect(msg).toBe("row 3: expected 2 fields but found 4");
    expect(refused("Time,Temp\n2026-01-01T00:00:00Z,4.1\n2026-01-01T00:01:00Z,warm\n")).toBe("row 3, column 'Temp': 'warm' is not a number");
  });

  it("importCsv refuses an unreadable timestamp, naming row and column", () => {
    expect(refused("Time,Temp\n2026-01-01T00:00:00Z,4.1\nyesterday,4.2\n")).toBe("row 3, column 'Time': 'yesterday' is not a date and time");
  });

  it("importCsv keeps missing readings as gaps, never zeros", () => {
    const r = importCsv(enc("Time,Temp\n2026-01-01T00:00:00Z,4\n2026-01-01T00:01:00Z,\n2026-01-01T00:02:00Z,NA\n2026-01-01T00:03:00Z,5\n"));
    expect(Array.from(r.series.air_C)).toEqual([4, NaN, NaN, 5]);
  });

  it("importCsv excludes implausible readings with a warning instead of clipping them", () => {
    const r = importCsv(enc("Time,Temp\n2026-01-01T00:00:00Z,4\n2026-01-01T00:01:00Z,999\n2026-01-01T00:02:00Z,5\n"));
    expect(Number.isNaN(r.series.air_C[1]!)).toBe(true);
    expect(r.warnings[0]).toMatch(/1 reading\(s\) outside -60 to 80 °C were excluded.*rows 3/);
  });

  it("importCsv sorts out-of-order rows and drops exact duplicates, reporting both", () => {
    const r = importCsv(enc("Time,Temp\n2026-01-01T00:02:00Z,6\n2026-01-01T00:00:00Z,4\n2026-01-01T00:00:00Z,4\n2026-01-01T00:01:00Z,5\n"));
    expect(Array.from(r.series.air_C)).toEqual([4, 5, 6]);
    expect(r.warnings.join(" ")).toMatch(/sorted.*1 exact duplicate row\(s\) dropped \(rows 4\)/);
  });

  it("importCsv refuses more repeated rows than distinct samples (and over 1,000), naming the limit and the first rows", () => {
    const head = "Time,Temp\n2026-01-01T00:00:00Z,4\n2026-01-01T00:01:00Z,5\n"; // rows 2 and 3
    const copies = (k: number) => head + "2026-01-01T00:01:00Z,5\n".repeat(k);
    // 1,000 copies of a 2-sample trace: at the allowance, read with a warning
    const ok = importCsv(enc(copies(DUPLICATE_ROWS_ALLOWED)));
    expect(ok.series.t_s.length).toBe(2);
    expect(ok.warnings.join(" ")).toContain("1000 exact duplicate row(s) dropped (rows 4, 5, 6, 7, 8, and 995 more)");
    // one more: refused; rows 4… are the copies (row 1 is the header)
    expect(refused(copies(DUPLICATE_ROWS_ALLOWED + 1))).toBe(
      "1001 rows repeat a timestamp already read (rows 4, 5, 6, 7, 8, and 996 more), more than the 2 distinct sample(s) the file holds: " +
        "a file may repeat at most as many rows as it has distinct timestamps, or 1000; check the export (was it appended to itself, or is the logger's clock stuck?)",
    );
    // an export appended to itself once (every row twice, 2,000 distinct) is still read
    let body = "";
    for (let i = 0; i < 2000; i++) body += `${new Date(Date.UTC(2026, 0, 1) + i * 60_000).toISOString()},4\n`;
    const doubled = importCsv(enc(`Time,Temp\n${body}${body}`));
    expect(doubled.series.t_s.length).toBe(2000);
    expect(doubled.warnings.join(" ")).toMatch(/sorted.*2000 exact duplicate row\(s\) dropped/);
  });

  it("import options cap their lists with a message naming the limit", () => {
    const missing = importOptionsSchema.safeParse({ missing: Array.from({ length: 21 }, (_, i) => `-${i + 900}`) });
    expect(missing.success ? "" : missing.error.issues[0]!.message).toBe("at most 20 missing-value codes are allowed");
    const ignored = importOptionsSchema.safeParse({ ignoreColumns: Array.from({ length: 201 }, (_, i) => `c${i}`) });
    expect(ignored.success ? "" : ignored.error.issues[0]!.message).toBe("at most 200 columns may be left out");
    expect(importOptionsSchema.safeParse({ missing: ["-999"], ignoreColumns: ["Door"] }).success).toBe(true);
  });

  it("importCsv refuses empty and header-only files", () => {
    expect(() => importCsv(new Uint8Array())).toThrow("the file is empty");
    expect(refused("Time,Temp\n")).toMatch(/no header row/);
  });

  it("importCsv refuses bytes that are not text", () => {
    expect(() => importCsv(Uint8Array.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00, 0x06, 0x00]))).toThrow(/not text/);
  });
});

describe("parseReading and ZoneResolver", () => {
  it("parseReading takes a decimal comma, thousands separators in groups of three, and a unit suffix", async () => {
    const { parseReading } = await import("@/lib/trace/values");
    expect(parseReading("3,25", ",")).toEqual({ value: 3.25 });
    expect(parseReading("1.234,5", ",")).toEqual({ value: 1234.5 });
    expect(parseReading("1,234.5", ".")).toEqual({ value: 1234.5 });
    expect(parseReading("-4.5 °C", ".")).toEqual({ value: -4.5, suffix: "C" });
    expect(parseReading("1,23.5", ".").value).toBeNaN(); // not a group of three
    expect(parseReading("12,4,1", ",").value).toBeNaN();
  });

  it("ZoneResolver places the repeated autumn hour by order and counts it (Europe/Berlin, 25 October 2026)", async () => {
    const { ZoneResolver, parseWallClock } = await import("@/lib/trace/timestamps");
    const z = new ZoneResolver("Europe/Berlin");
    // 02:30 occurs twice: first at 00:30 UTC (CEST, UTC+2), then at 01:30 UTC (CET, UTC+1)
    const first = z.toEpochMs(parseWallClock("2026-10-25 02:30", "ymd")!, Date.UTC(2026, 9, 25, 0, 15));
    const second = z.toEpochMs(parseWallClock("2026-10-25 02:30", "ymd")!, first + 1);
    expect(new Date(first).toISOString()).toBe("2026-10-25T00:30:00.000Z");
    expect(new Date(second).toISOString()).toBe("2026-10-25T01:30:00.000Z");
    expect(z.ambiguous).toBe(2);
    // 02:30 on 29 March 2026 does not exist (clocks jump 02:00 → 03:00); read with the winter offset
    const skipped = z.toEpochMs(parseWallClock("2026-03-29 02:30", "ymd")!, 0);
    expect(new Date(skipped).toISOString()).toBe("2026-03-29T01:30:00.000Z");
    expect(z.skipped).toBe(1);
  });
});

describe("elapsed times", () => {
  it("importCsv reads a start time without an offset from the header lines in the chosen zone", () => {
    const text = "Start time: 2026-07-01 08:00\nElapsed (min),Air\n0,3.0\n30,3.5\n";
    const r = importCsv(new TextEncoder().encode(text), { timeZone: "Europe/Berlin" });
    // 08:00 CEST (UTC+2) is 06:00 UTC, whatever the machine's own zone (these tests run in America/Sao_Paulo)
    expect(r.series.t_s[0]).toBe(Date.UTC(2026, 6, 1, 6) / 1000);
    expect(r.series.t_s[1]! - r.series.t_s[0]!).toBe(1800);
    expect(r.settings.startTime).toBe("2026-07-01T06:00:00.000Z");
  });
});
