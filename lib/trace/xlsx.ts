import { unzipSync } from "fflate";
import readXlsxFile from "read-excel-file/universal";
import { TraceImportError } from "./errors";

/**
 * The most a workbook may inflate to, in bytes, before it is read. A sheet's XML takes about 150 bytes
 * per row of three cells, so 100 MB is over half a million rows; larger logs import faster as CSV. Checked
 * from the archive's directory without inflating anything, so a "zip bomb" (a small file that inflates
 * to gigabytes) is refused at once instead of holding the server for minutes.
 */
export const MAX_WORKBOOK_INFLATED_BYTES = 100 * 1024 * 1024;

/** The total size the archive's entries declare once inflated (NaN when the archive cannot be read); throws when it is over the limit. */
export function checkWorkbookSize(bytes: Uint8Array, limit = MAX_WORKBOOK_INFLATED_BYTES): number {
  let total = 0;
  try {
    // The filter sees each entry's declared size and, returning false, inflates nothing.
    unzipSync(bytes, {
      filter: (f) => {
        total += f.originalSize;
        return false;
      },
    });
  } catch {
    // Not a readable archive: the workbook reader says why, in the words the import reports.
    return Number.NaN;
  }
  if (total > limit) {
    throw new TraceImportError(
      `the workbook inflates to ${(total / 1048576).toFixed(0)} MB, more than the ${(limit / 1048576).toFixed(0)} MB a workbook may hold; export the sheet as CSV and import that`,
    );
  }
  return total;
}

const pad = (n: number, w = 2) => String(n).padStart(w, "0");

/**
 * Excel stores date-times as day counts without a zone; read-excel-file returns them as Dates whose
 * UTC fields are the wall clock. Written back as "YYYY-MM-DD HH:MM:SS(.sss)" so the import's time
 * zone setting applies. A serial's floating-point error (about a millisecond) is rounded away to the
 * nearest second when it is within 5 ms of one.
 */
function wallClockText(d: Date): string {
  let ms = d.getTime();
  const r = Math.round(ms / 1000) * 1000;
  if (Math.abs(ms - r) <= 5) ms = r;
  const w = new Date(ms);
  const frac = w.getUTCMilliseconds();
  return `${w.getUTCFullYear()}-${pad(w.getUTCMonth() + 1)}-${pad(w.getUTCDate())} ${pad(w.getUTCHours())}:${pad(w.getUTCMinutes())}:${pad(w.getUTCSeconds())}${frac ? `.${pad(frac, 3)}` : ""}`;
}

function cellText(v: unknown): string {
  if (v === null || v === undefined) return "";
  if (v instanceof Date) return wallClockText(v);
  if (typeof v === "number") return String(v);
  if (typeof v === "boolean") return v ? "TRUE" : "FALSE";
  return String(v);
}

/**
 * One sheet of a workbook as tab-separated text (quoted where a cell holds a tab, quote or line
 * break), for the same import as a text export; tabs leave a decimal comma in text cells readable.
 * The first sheet unless one is named.
 */
export async function xlsxToCsvText(bytes: Uint8Array, sheet?: string, maxInflatedBytes = MAX_WORKBOOK_INFLATED_BYTES): Promise<{ text: string; sheet: string }> {
  checkWorkbookSize(bytes, maxInflatedBytes);
  let sheets: Array<{ sheet: string; data: unknown[][] }>;
  try {
    // a copy into its own ArrayBuffer: a Node Buffer may be a view into a larger shared pool
    sheets = (await readXlsxFile(new Uint8Array(bytes).buffer)) as unknown as Array<{ sheet: string; data: unknown[][] }>;
  } catch (e) {
    throw new TraceImportError(`the file looks like a zip archive but is not a readable .xlsx workbook (${(e as Error).message})`);
  }
  if (sheets.length === 0) throw new TraceImportError("the workbook has no sheets");
  const chosen = sheet === undefined ? sheets[0]! : sheets.find((s) => s.sheet === sheet);
  if (!chosen) throw new TraceImportError(`the workbook has no sheet named '${sheet}' (sheets: ${sheets.map((s) => `'${s.sheet}'`).join(", ")})`);
  const quote = (s: string) => (/["\t\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
  const text = chosen.data.map((row) => row.map((c) => quote(cellText(c))).join("\t")).join("\n") + "\n";
  return { text, sheet: chosen.sheet };
}
