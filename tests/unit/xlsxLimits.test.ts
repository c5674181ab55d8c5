import { readFileSync } from "node:fs";
import path from "node:path";
import { strToU8, zipSync } from "fflate";
import { describe, expect, test } from "vitest";
import { checkWorkbookSize, MAX_WORKBOOK_INFLATED_BYTES, xlsxToCsvText } from "@/lib/trace/xlsx";
import { TraceImportError } from "@/lib/trace/errors";

const GOOD = path.join(__dirname, "../fixtures/traces/good/20-workbook-date-cells.xlsx");

describe("workbook size limit", () => {
  test("checkWorkbookSize sums the entries' declared sizes without inflating them", () => {
    const zip = zipSync({ "a.xml": strToU8("x".repeat(1000)), "b.xml": strToU8("y".repeat(234)) });
    expect(checkWorkbookSize(zip)).toBe(1234);
  });

  test("a corpus workbook is read under the default limit and refused under a smaller one, by name", async () => {
    const bytes = new Uint8Array(readFileSync(GOOD));
    const inflated = checkWorkbookSize(bytes);
    expect(inflated).toBeLessThan(MAX_WORKBOOK_INFLATED_BYTES);
    await expect(xlsxToCsvText(bytes)).resolves.toMatchObject({ sheet: expect.any(String) });
    await expect(xlsxToCsvText(bytes, undefined, inflated - 1)).rejects.toThrow(TraceImportError);
  });

  test("a small archive that inflates past 100 MB (a zip bomb) is refused at once with its size", async () => {
    // 110 MB of one repeated character compresses to about 100 kB.
    const bomb = zipSync({ "xl/worksheets/sheet1.xml": new Uint8Array(110 * 1024 * 1024).fill(0x41) }, { level: 9 });
    expect(bomb.length).toBeLessThan(1024 * 1024);
    const t0 = performance.now();
    await expect(xlsxToCsvText(bomb)).rejects.toThrow("the workbook inflates to 110 MB, more than the 100 MB a workbook may hold; export the sheet as CSV and import that");
    expect(performance.now() - t0).toBeLessThan(5_000);
  });
});
