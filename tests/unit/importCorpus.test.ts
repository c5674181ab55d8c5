import { describe, it, expect } from "vitest";
import { readFileSync } from "node:fs";
import path from "node:path";
import { importTraceFile, type ImportOptions } from "@/lib/trace";

// The committed corpus (tests/fixtures/traces, written by make-corpus.ts; invented data) with the
// outcome expected for each file: imported with these times, readings, settings and warnings, or
// refused with this message. Expectations were checked by hand (see expected.json's _origin).
const DIR = path.join(__dirname, "../fixtures/traces");
const expected = JSON.parse(readFileSync(path.join(DIR, "expected.json"), "utf8")) as Record<string, unknown>;
const options = JSON.parse(readFileSync(path.join(DIR, "options.json"), "utf8")) as Record<string, ImportOptions>;

type Imported = { times: string[]; air_C: Array<number | null>; probe_C?: Array<number | null>; settings: Record<string, string>; warnings: string[] };
const files = Object.entries(expected).filter(([k]) => !k.startsWith("_")) as Array<[string, { imported?: Imported; refused?: string }]>;

describe("import corpus", () => {
  it("has at least 40 bad or hostile files and a good file for each supported format", () => {
    expect(files.filter(([k]) => k.startsWith("bad/")).length).toBeGreaterThanOrEqual(40);
    expect(files.filter(([k]) => k.startsWith("good/")).length).toBeGreaterThanOrEqual(21);
  });

  for (const [name, want] of files) {
    it(`${name}: ${want.refused ? "refused with its row and column" : "imported as expected"}`, async () => {
      const bytes = readFileSync(path.join(DIR, name));
      const run = () => importTraceFile(bytes, options[name] ?? {});
      if (want.refused) {
        await expect(run()).rejects.toThrow(want.refused);
        return;
      }
      const r = await run();
      const got = want.imported!;
      expect(Array.from(r.series.t_s, (t) => new Date(t * 1000).toISOString())).toEqual(got.times);
      expect(Array.from(r.series.air_C, (x) => (Number.isNaN(x) ? null : Number(x.toFixed(6))))).toEqual(got.air_C);
      if (got.probe_C) expect(Array.from(r.series.probe_C!, (x) => (Number.isNaN(x) ? null : Number(x.toFixed(6))))).toEqual(got.probe_C);
      else expect(r.series.probe_C).toBeUndefined();
      expect(r.settings).toMatchObject(got.settings);
      expect(r.warnings).toEqual(got.warnings);
    });
  }
});
