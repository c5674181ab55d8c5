// Matching uploaded files to a shipment's logger entries (issue 15): the serial from the metadata lines
// the importer keeps, else a file-name pattern; each entry proposed for one file only. Examples invented.
import { describe, expect, it } from "vitest";
import { globRegExp, matchFiles, serialFromMetadata } from "@/lib/shipment/matching";
import { importCsv } from "@/lib/trace";

const meta = (text: string) => importCsv(new TextEncoder().encode(text)).preview.metadata;

describe("serialFromMetadata", () => {
  it("reads the serial from the metadata lines as the importer keeps them", () => {
    expect(serialFromMetadata(meta("Logger serial: HX-20417\nTrip: Route 7\n\nTime,Air (°C)\n2026-06-16T05:00:00Z,3.1\n2026-06-16T05:02:00Z,3.2\n"))).toBe("HX-20417");
    expect(serialFromMetadata(meta("Device ID;A1234\nTime;Air\n2026-06-16T05:00:00Z;3,1\n2026-06-16T05:02:00Z;3,2\n"))).toBe("A1234");
    expect(serialFromMetadata(meta("S/N = 00917/B (two probes)\nTime,Air\n2026-06-16T05:00:00Z,3.1\n2026-06-16T05:02:00Z,3.2\n"))).toBe("00917/B");
    expect(serialFromMetadata(meta("Time,Air\n2026-06-16T05:00:00Z,3.1\n2026-06-16T05:02:00Z,3.2\n"))).toBeNull();
    // a title line that only mentions a serial number
    expect(serialFromMetadata([{ row: 1, key: "", value: "Logger serial number K-77 export" }])).toBe("K-77");
  });
});

describe("matchFiles", () => {
  it("matches by serial first, then by file name, each entry once", () => {
    const targets = [
      { id: "front", serial: "SN-1" },
      { id: "rear", pattern: "rear-*.csv" },
      { id: "tote3", pattern: "*tote?3*" },
    ];
    const files = [
      { name: "rear-a.csv", serial: "sn-1" }, // the serial wins over the name, case-insensitively
      { name: "rear-b.csv", serial: null },
      { name: "rear-c.csv", serial: null }, // the rear entry is taken
      { name: "Route7_TOTE-3.CSV", serial: "SN-9" },
    ];
    expect(matchFiles(files, targets)).toEqual([
      { file: "rear-a.csv", target: "front", by: "serial" },
      { file: "rear-b.csv", target: "rear", by: "file-name" },
      { file: "rear-c.csv", target: null, by: null },
      { file: "Route7_TOTE-3.CSV", target: "tote3", by: "file-name" },
    ]);
  });
  it("a pattern is a whole-name glob with regular-expression characters taken literally", () => {
    expect(globRegExp("a.csv").test("abcsv")).toBe(false);
    expect(globRegExp("(x)*.csv").test("(x) 1.csv")).toBe(true);
    expect(globRegExp("rear-*.csv").test("my-rear-1.csv")).toBe(false);
  });
});
