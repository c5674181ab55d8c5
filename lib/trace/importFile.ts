import { importCsv, type TraceImport } from "./importCsv";
import type { ImportOptions } from "./settings";

/** A .xlsx workbook is a zip archive: it starts with the local-file signature PK\x03\x04. */
export function looksLikeXlsx(bytes: Uint8Array): boolean {
  return bytes[0] === 0x50 && bytes[1] === 0x4b && bytes[2] === 0x03 && bytes[3] === 0x04;
}

/**
 * Imports a logger file of either kind: delimited text, or an .xlsx workbook (one sheet, read by the
 * read-excel-file package and then imported like a tab-separated export). The workbook's bytes are
 * what is stored; the resolved settings say it was a workbook and which sheet.
 */
export async function importTraceFile(bytes: Uint8Array, options: ImportOptions = {}, onProgress?: (fraction: number) => void): Promise<TraceImport> {
  if (!looksLikeXlsx(bytes)) return importCsv(bytes, options, onProgress);
  // loaded only for a workbook: a CSV import (and the CLI's start) does not parse the zip and XML readers
  const { xlsxToCsvText } = await import("./xlsx");
  const { text, sheet } = await xlsxToCsvText(bytes, options.sheet);
  const r = importCsv(new TextEncoder().encode(text), { ...options, delimiter: "\t", encoding: "utf-8" }, onProgress);
  r.settings = { ...r.settings, source: "xlsx", sheet };
  return r;
}
