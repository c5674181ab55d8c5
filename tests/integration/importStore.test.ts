import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { testDatabaseUrl } from "../helpers/database";
import { TEST_ACTOR } from "../helpers/accounts";

// Every refused file of the corpus goes through the storing path: nothing may be written.
const dir = mkdtempSync(path.join(tmpdir(), "corelag-imp-"));
const url = testDatabaseUrl(dir, "import.db");
process.env.DATABASE_URL = url;
const CORPUS = path.join(__dirname, "../fixtures/traces");
const expected = JSON.parse(readFileSync(path.join(CORPUS, "expected.json"), "utf8")) as Record<string, { refused?: string }>;

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
});

afterAll(async () => {
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

describe("importAndStoreTrace", () => {
  it("stores nothing, not even an audit entry, for any refused file of the corpus", async () => {
    const { importAndStoreTrace } = await import("@/lib/services/traces");
    const { db } = await import("@/lib/db/client");
    const refused = readdirSync(path.join(CORPUS, "bad")).filter((f) => expected[`bad/${f}`]?.refused);
    expect(refused.length).toBeGreaterThanOrEqual(30);
    for (const f of refused) {
      const res = await importAndStoreTrace(readFileSync(path.join(CORPUS, "bad", f)), { fileName: f, options: {} }, TEST_ACTOR);
      const message = `${f}: ${expected[`bad/${f}`]!.refused}. Nothing was stored.`;
      expect(res).toMatchObject({ ok: false, message });
      // the row and column at fault travel with the refusal (the v1 API names them), and agree with the message
      const at = res as { row?: number; column?: string };
      if (at.row !== undefined) expect(message).toContain(`row ${at.row}`);
      if (at.column !== undefined) expect(message).toContain(at.column);
    }
    expect(await db.trace.count()).toBe(0);
    expect(await db.auditEntry.count()).toBe(0);
  });

  it("stores an accepted file with its resolved settings, and the stored settings repeat the import exactly", async () => {
    const { importAndStoreTrace } = await import("@/lib/services/traces");
    const { getTrace, getTraceOriginal } = await import("@/lib/db/traces");
    const { importCsv, optionsFromSettings } = await import("@/lib/trace");
    const bytes = readFileSync(path.join(CORPUS, "good", "12-three-channels.csv"));
    const res = await importAndStoreTrace(bytes, { fileName: "12-three-channels.csv", options: {} }, TEST_ACTOR);
    expect(res.ok).toBe(true);
    const t = (await getTrace((res as { traceId: string }).traceId))!;
    expect(t.meta.hasProbe).toBe(true);
    const again = importCsv((await getTraceOriginal(t.meta.id))!.bytes, optionsFromSettings(t.meta.importSettings));
    expect(Array.from(again.series.probe_C!)).toEqual(Array.from(t.series.probe_C!));
    expect(Array.from(again.series.air_C)).toEqual(Array.from(t.series.air_C));
  });

  it("stores a workbook as its own bytes, and its stored settings repeat the import exactly", async () => {
    const { importAndStoreTrace } = await import("@/lib/services/traces");
    const { getTrace, getTraceOriginal } = await import("@/lib/db/traces");
    const { importTraceFile, optionsFromSettings, sha256Hex } = await import("@/lib/trace");
    const bytes = readFileSync(path.join(CORPUS, "good", "20-workbook-date-cells.xlsx"));
    const res = await importAndStoreTrace(bytes, { fileName: "20-workbook-date-cells.xlsx", options: {} }, TEST_ACTOR);
    const t = (await getTrace((res as { traceId: string }).traceId))!;
    expect(t.meta.sha256).toBe(sha256Hex(bytes));
    expect(t.meta.importSettings).toMatchObject({ source: "xlsx", sheet: "Sheet1" });
    const again = await importTraceFile((await getTraceOriginal(t.meta.id))!.bytes, optionsFromSettings(t.meta.importSettings));
    expect(Array.from(again.series.t_s)).toEqual(Array.from(t.series.t_s));
    expect(Array.from(again.series.air_C)).toEqual(Array.from(t.series.air_C));
  });
});
