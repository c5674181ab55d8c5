import { importCsv, type TraceImport } from "./importCsv";
import type { ImportOptions } from "./settings";
import { looksLikeXlsx, xlsxToCsvText } from "./xlsx";

/**
 * Imports a logger file of either kind: delimited text, or an .xlsx workbook (one sheet, read by the
 * read-excel-file package and then imported like a tab-separated export). The workbook's bytes are
 * what is stored; the resolved settings say it was a workbook and which sheet.
 */
export async function importTraceFile(bytes: Uint8Array, options: ImportOptions = {}, onProgress?: (fraction: number) => void): Promise<TraceImport> {
  if (!looksLikeXlsx(bytes)) return importCsv(bytes, options, onProgress);
  const { text, sheet } = await xlsxToCsvText(bytes, options.sheet);
  const r = importCsv(new TextEncoder().encode(text), { ...options, delimiter: "\t", encoding: "utf-8" }, onProgress);
  r.settings = { ...r.settings, source: "xlsx", sheet };
  return r;
}
