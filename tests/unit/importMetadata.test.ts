import { describe, it, expect } from "vitest";
import { importCsv, optionsFromSettings, TraceImportError } from "@/lib/trace";
import { decodeText, notWindows1252, utf16Problem } from "@/lib/trace/decode";
import { utf16 } from "../helpers/encode";

// Metadata lines above and below the data, the UTC assumption, and text that is not in a supported
// encoding (issue #9). Expected values worked by hand from each small file.

const enc = (s: string) => new TextEncoder().encode(s);
const refusal = (f: () => unknown): string => {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(TraceImportError);
    return (e as Error).message;
  }
  throw new Error("expected a refusal");
};

const ISSUE_FILE = "Logger serial;A1234\nStart;28.03.2026 23:00\nInterval;15 min\nDate;Time;Air °F;Probe °F\n28.03.2026;23:00;41.0;39.2\n28.03.2026;23:15;42.8;40.1\n";

describe("importCsv: metadata lines that look like data", () => {
  it("importCsv takes the first line followed by data as the header, not the first key;value line", () => {
    // Before: "row 2, column 'Logger serial': 'Start' is not a number"
    const r = importCsv(enc(ISSUE_FILE), { timeZone: "Europe/Berlin" });
    expect(r.settings).toMatchObject({ headerRow: 4, dateColumn: "Date", timeColumn: "Time", airColumn: "Air °F", productColumn: "Probe °F", dateOrder: "dmy" });
    // 28.03.2026 23:00 in Berlin is CET (UTC+1; summer time begins 29 March 2026 at 02:00) = 22:00 UTC
    expect(Array.from(r.series.t_s)).toEqual([Date.UTC(2026, 2, 28, 22) / 1000, Date.UTC(2026, 2, 28, 22, 15) / 1000]);
    // 41.0 °F = 5 °C, 42.8 °F = 6 °C; 39.2 °F = 4 °C, 40.1 °F = 4.5 °C
    expect(Array.from(r.series.air_C, (x) => Number(x.toFixed(9)))).toEqual([5, 6]);
    expect(Array.from(r.series.probe_C!, (x) => Number(x.toFixed(9)))).toEqual([4, 4.5]);
  });

  it("importCsv keeps the metadata lines as key/value pairs in the settings and the preview", () => {
    const r = importCsv(enc(ISSUE_FILE), { timeZone: "Europe/Berlin" });
    const want = [
      { row: 1, key: "Logger serial", value: "A1234" },
      { row: 2, key: "Start", value: "28.03.2026 23:00" },
      { row: 3, key: "Interval", value: "15 min" },
    ];
    expect(r.settings.metadata).toEqual(want);
    expect(r.preview.metadata).toEqual(want);
    expect(r.preview.header).toEqual(["Date", "Time", "Air °F", "Probe °F"]);
  });

  it("importCsv with the stored settings repeats the import of a file with metadata exactly", () => {
    const first = importCsv(enc(ISSUE_FILE), { timeZone: "Europe/Berlin" });
    const again = importCsv(enc(ISSUE_FILE), optionsFromSettings(first.settings));
    expect(Array.from(again.series.t_s)).toEqual(Array.from(first.series.t_s));
    expect(Array.from(again.series.air_C)).toEqual(Array.from(first.series.air_C));
    expect(again.settings.metadata).toEqual(first.settings.metadata);
    expect(again.settings.headerRow).toBe(4);
  });

  it("importCsv reads `Key: value` lines in the first cell, and a title line as a value without a key", () => {
    const r = importCsv(enc("Export of logger TL-9\nSite: dock 4, bay 2\nTime,Air\n2026-03-02T06:00:00Z,3.1\n2026-03-02T06:05:00Z,3.2\n"));
    expect(r.settings.metadata).toEqual([
      { row: 1, key: "", value: "Export of logger TL-9" },
      { row: 2, key: "Site", value: "dock 4, bay 2" },
    ]);
  });

  it("importCsv keeps footer lines after a blank line as metadata, and refuses data that follows them", () => {
    const r = importCsv(enc("Time,Air\n2026-03-02T06:00:00Z,3.1\n2026-03-02T06:05:00Z,3.2\n\nEnd,2026-03-02T06:05:00Z\nSamples,2\n"));
    expect(r.series.t_s.length).toBe(2);
    expect(r.settings.metadata).toEqual([
      { row: 5, key: "End", value: "2026-03-02T06:05:00Z" },
      { row: 6, key: "Samples", value: "2" },
    ]);
    expect(refusal(() => importCsv(enc("Time,Air\n2026-03-02T06:00:00Z,3.1\n2026-03-02T06:05:00Z,3.2\nSamples\n2026-03-02T06:10:00Z,3.3\n")))).toBe(
      "row 5: a data row after the footer lines that begin on row 4; a file must hold one table",
    );
  });

  it("importCsv still finds the header when a text column (events) sits beside the readings", () => {
    const r = importCsv(enc("Serial;B77\nStart;02.03.2026;06:00\nTime;Air;Event\n2026-03-02T06:00:00Z;3.1;door open\n2026-03-02T06:05:00Z;3.2;\n"));
    expect(r.settings).toMatchObject({ headerRow: 3, timeColumn: "Time", airColumn: "Air" });
    expect(r.settings.metadata).toEqual([
      { row: 1, key: "Serial", value: "B77" },
      { row: 2, key: "Start", value: "02.03.2026; 06:00" },
    ]);
  });

  it("importCsv detects the settings from the data rows only, not from footer lines with the same field count", () => {
    // The footer's "checked" is 1 of 4 cells in the probe column: counted, fewer than 80 % would be numbers and the probe would be lost
    const r = importCsv(enc("Time;Air;Probe\n2026-03-02T06:00:00Z;3,1;2,0\n2026-03-02T06:05:00Z;3,4;2,1\n2026-03-02T06:10:00Z;3,9;2,3\n\nChecked by;QA;checked\n"));
    expect(r.settings).toMatchObject({ airColumn: "Air", productColumn: "Probe", decimal: "," });
    expect(Array.from(r.series.probe_C!)).toEqual([2.0, 2.1, 2.3]);
    expect(r.settings.metadata).toEqual([{ row: 6, key: "Checked by", value: "QA; checked" }]);
  });

  it("importCsv still refuses a truncated last row: a line that begins with a time is never a footer", () => {
    expect(refusal(() => importCsv(enc("Time,Air\n2026-03-02T06:00:00Z,3.1\n2026-03-02T06:05:00Z,3.2\n2026-03-02T06:10:00Z\n")))).toBe("row 4: expected 2 fields but found 1");
  });
});

describe("importCsv: times without an offset", () => {
  const naive = "Time,Air\n2026-03-02 06:00,3.1\n2026-03-02 06:05,3.2\n";
  const warning = "the times carry no UTC offset and no time zone was chosen, so they were read as UTC; if the logger kept local time, choose its time zone";
  it("importCsv warns that times without an offset and without a chosen zone were read as UTC", () => {
    const r = importCsv(enc(naive));
    expect(r.warnings).toEqual([warning]);
    expect(r.series.t_s[0]).toBe(Date.UTC(2026, 2, 2, 6) / 1000);
  });
  it("importCsv gives no such warning when the zone is chosen, or when every time has an offset", () => {
    expect(importCsv(enc(naive), { timeZone: "UTC" }).warnings).toEqual([]);
    expect(importCsv(enc("Time,Air\n2026-03-02T06:00:00+01:00,3.1\n2026-03-02T06:05:00Z,3.2\n")).warnings).toEqual([]);
  });
  it("importCsv counts the rows without an offset when only some have one", () => {
    const r = importCsv(enc("Time,Air\n2026-03-02T06:00:00Z,3.1\n2026-03-02 06:05,3.2\n2026-03-02 06:10,3.3\n"));
    expect(r.warnings[0]).toBe("2 of 3 rows' times carry no UTC offset and no time zone was chosen, so they were read as UTC; if the logger kept local time, choose its time zone");
  });
  it("importCsv warns about an elapsed-time start without an offset read as UTC", () => {
    const r = importCsv(enc("Start time: 2026-03-02 06:00\nElapsed (min),Air\n0,3.1\n5,3.2\n"));
    expect(r.warnings[0]).toBe("the start time '2026-03-02 06:00' carries no UTC offset and no time zone was chosen, so it was read as UTC; if the logger kept local time, choose its time zone");
    expect(r.series.t_s[0]).toBe(Date.UTC(2026, 2, 2, 6) / 1000);
  });
});

describe("decodeText: text that does not decode cleanly is refused, never a TypeError", () => {
  it("decodeText refuses UTF-16 with a byte-order mark and an odd number of bytes", () => {
    const bytes = new Uint8Array([...utf16("Time,Air\n", false), 0x41]);
    // 2 (BOM) + 9 characters × 2 + 1 = 21 bytes
    expect(refusal(() => decodeText(bytes))).toBe("the file starts with a UTF-16LE byte-order mark but is not valid UTF-16LE: it has an odd number of bytes (21), so its last character is cut in half; the file may be cut short or damaged");
  });
  it("decodeText refuses a lone surrogate in UTF-16BE, giving its byte", () => {
    // BOM FE FF, then "A" (00 41), then a lone low surrogate DC00 at byte 4
    expect(refusal(() => decodeText(new Uint8Array([0xfe, 0xff, 0x00, 0x41, 0xdc, 0x00])))).toMatch(/a lone surrogate 0xdc00 at byte 4 has no partner/);
  });
  it("decodeText refuses an encoding option that does not fit the file", () => {
    expect(refusal(() => decodeText(enc("Time,Air\n"), "utf-16le"))).toMatch(/^the encoding chosen \(UTF-16LE\) does not fit the file: it has an odd number of bytes \(9\)/);
    expect(refusal(() => decodeText(utf16("Time,Air\n", false), "utf-16be"))).toMatch(/^the encoding chosen \(UTF-16BE\) does not fit the file: it starts with a UTF-16LE byte-order mark/);
    expect(refusal(() => decodeText(utf16("Time,Air\n", true), "utf-8"))).toMatch(/^the encoding chosen \(utf-8\) does not fit the file: it starts with a UTF-16 byte-order mark/);
    expect(refusal(() => decodeText(new Uint8Array([0x54, 0xb0, 0x43]), "utf-8"))).toBe("the encoding chosen (UTF-8) does not fit the file: byte 0xb0 at offset 1 is not valid UTF-8; choose another encoding, or leave it to be detected");
  });
  it("decodeText refuses Shift-JIS text instead of garbling it as Windows-1252", () => {
    // 日時,温度 in Shift-JIS (JIS X 0208): 93 FA 8E 9E 2C 89 B7 93 78
    const sjis = new Uint8Array([0x93, 0xfa, 0x8e, 0x9e, 0x2c, 0x89, 0xb7, 0x93, 0x78, 0x0a]);
    expect(refusal(() => decodeText(sjis))).toMatch(/^the file is neither UTF-8 nor Windows-1252 text \(7 of its 7 non-ASCII bytes come in multi-byte sequences\)/);
    // with the encoding chosen, the user has said what it is
    expect(decodeText(sjis, "windows-1252").encoding).toBe("windows-1252");
  });
  it("decodeText still reads Western Windows-1252: °C, accented letters, one 'öß'", () => {
    // "Größe;Temp (°C);Été" in Windows-1252: ö F6, ß DF, ° B0, É C9, é E9
    const bytes = Uint8Array.from("Größe;Temp (°C);Été\n", (c) => c.charCodeAt(0));
    expect(decodeText(bytes)).toEqual({ text: "Größe;Temp (°C);Été\n", encoding: "windows-1252" });
  });
  it("notWindows1252 names a byte Windows-1252 leaves undefined", () => {
    expect(notWindows1252(new Uint8Array([0x41, 0x81, 0x42]))).toBe("byte 0x81 at offset 1 is not a Windows-1252 character");
  });
  it("utf16Problem accepts a proper surrogate pair", () => {
    // U+1F321 (thermometer) = D83C DF21
    expect(utf16Problem(new Uint8Array([0x3c, 0xd8, 0x21, 0xdf]), false)).toBeNull();
  });
});
