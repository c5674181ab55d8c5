import Papa from "papaparse";
import { decodeText } from "./decode";
import { TraceImportError } from "./errors";
import type { ImportOptions, ResolvedImportSettings } from "./settings";
import type { TraceSeries } from "./series";
import {
  isMissingToken,
  parseStrictNumber,
  parseTimestamp_s,
  toCelsius,
  unitFromHeader,
  type TemperatureUnit,
} from "./values";

/** Readings outside this range are flagged and excluded, never clipped (common-practice default). */
export const PLAUSIBLE_RANGE_C = { min: -60, max: 80 } as const;

export interface TraceImport {
  series: TraceSeries;
  settings: ResolvedImportSettings;
  warnings: string[];
}

const DELIMITERS = [",", ";", "\t", "|"] as const;
type Delimiter = (typeof DELIMITERS)[number];
const MAX_LISTED = 5;

function detectDelimiter(text: string): Delimiter {
  // The delimiter that splits the most of the first lines into the same number (>1) of fields.
  const lines = text.split(/\r?\n/, 40).filter((l) => l.trim() !== "");
  let best: Delimiter = ",";
  let bestScore = 0;
  for (const d of DELIMITERS) {
    const counts = lines.map((l) => l.split(d).length).filter((n) => n > 1);
    if (counts.length === 0) continue;
    const last = counts[counts.length - 1]!;
    const score = counts.filter((n) => n === last).length;
    if (score > bestScore) [best, bestScore] = [d, score];
  }
  return best;
}

const TIME_HEADER = /time|date|stamp|zeit|heure/i;
const AIR_HEADER = /air|temp|°|deg|ambient/i;

/** Index of the header: the first row followed by a row with a timestamp and a number. */
function findHeaderRow(rows: string[][], zone: string): number {
  for (let i = 0; i + 1 < rows.length && i < 200; i++) {
    const head = rows[i]!;
    const next = rows[i + 1]!;
    if (head.length < 2 || next.length !== head.length) continue;
    const hasTime = next.some((c) => Number.isFinite(parseTimestamp_s(c, zone)));
    const hasNumber = next.some((c) => Number.isFinite(parseStrictNumber(c)));
    const headIsText = head.every((c) => !Number.isFinite(parseStrictNumber(c)));
    if (hasTime && hasNumber && headIsText) return i;
  }
  throw new TraceImportError(
    "no header row was found: expected a row of column names followed by rows with a timestamp and a temperature",
  );
}

function pickColumn(header: string[], wanted: string | undefined, pattern: RegExp, exclude: number, role: string): number {
  if (wanted !== undefined) {
    const i = header.findIndex((h) => h.trim() === wanted);
    if (i < 0) throw new TraceImportError(`there is no column named '${wanted}' (columns: ${header.map((h) => `'${h.trim()}'`).join(", ")})`);
    return i;
  }
  const i = header.findIndex((h, j) => j !== exclude && pattern.test(h));
  if (i >= 0) return i;
  const fallback = header.findIndex((_, j) => j !== exclude);
  if (fallback < 0) throw new TraceImportError(`no ${role} column was found`);
  return fallback;
}

/**
 * Reads a delimited logger export (one timestamp column and one air-temperature column).
 * Refuses the whole file on the first unreadable cell, naming row (1-based, as in the file) and column.
 * Out-of-order rows are sorted and exact duplicates dropped, each with a warning; for a conflicting
 * duplicate (same time, other value) the first reading in file order is kept, with a warning.
 */
export function importCsv(bytes: Uint8Array, options: ImportOptions = {}): TraceImport {
  const text = decodeText(bytes);
  if (text.trim() === "") throw new TraceImportError("the file holds no text");
  const zone = options.timeZone ?? "UTC";
  const delimiter = options.delimiter ?? detectDelimiter(text);
  const parsed = Papa.parse<string[]>(text, { delimiter, skipEmptyLines: false });
  const rows = parsed.data;
  const headerIdx = findHeaderRow(rows, zone);
  const header = rows[headerIdx]!.map((h) => h.trim());
  const timeIdx = pickColumn(header, options.timeColumn, TIME_HEADER, -1, "timestamp");
  const airIdx = pickColumn(header, options.airColumn, AIR_HEADER, timeIdx, "air temperature");
  const timeName = header[timeIdx]!;
  const airName = header[airIdx]!;
  const unit: TemperatureUnit = options.unit ?? unitFromHeader(airName) ?? "C";

  const warnings: string[] = [];
  const implausible: number[] = [];
  const times: number[] = [];
  const values: number[] = [];
  const fileRows: number[] = [];
  for (let r = headerIdx + 1; r < rows.length; r++) {
    const row = rows[r]!;
    const rowNo = r + 1;
    if (row.length === 1 && row[0]!.trim() === "") continue; // blank line
    if (row.length !== header.length) {
      throw new TraceImportError(`row ${rowNo}: expected ${header.length} fields but found ${row.length}`, rowNo);
    }
    const timeText = row[timeIdx]!;
    const t = parseTimestamp_s(timeText, zone);
    if (!Number.isFinite(t)) {
      throw new TraceImportError(`row ${rowNo}, column '${timeName}': '${timeText}' is not a timestamp`, rowNo, timeName);
    }
    const airText = row[airIdx]!;
    let v = Number.NaN;
    if (!isMissingToken(airText)) {
      const raw = parseStrictNumber(airText);
      if (!Number.isFinite(raw)) {
        throw new TraceImportError(`row ${rowNo}, column '${airName}': '${airText}' is not a number`, rowNo, airName);
      }
      v = toCelsius(raw, unit);
      if (v < PLAUSIBLE_RANGE_C.min || v > PLAUSIBLE_RANGE_C.max) {
        implausible.push(rowNo);
        v = Number.NaN;
      }
    }
    times.push(t);
    values.push(v);
    fileRows.push(rowNo);
  }
  if (times.length < 2) throw new TraceImportError("the file has fewer than two data rows");
  if (implausible.length > 0) {
    warnings.push(
      `${implausible.length} reading(s) outside ${PLAUSIBLE_RANGE_C.min} to ${PLAUSIBLE_RANGE_C.max} °C were excluded as implausible (rows ${listRows(implausible)})`,
    );
  }

  const series = orderAndDeduplicate(times, values, fileRows, warnings);
  trimMissingEnds(series, warnings);
  if (series.t_s.length < 2) throw new TraceImportError("fewer than two valid air readings remain after import");
  const settings: ResolvedImportSettings = {
    parser: "corelag-csv-1",
    delimiter,
    headerRow: headerIdx + 1,
    timeColumn: timeName,
    airColumn: airName,
    unit,
    timeZone: zone,
  };
  return { series, settings, warnings };
}

function listRows(rows: number[]): string {
  const shown = rows.slice(0, MAX_LISTED).join(", ");
  return rows.length > MAX_LISTED ? `${shown}, and ${rows.length - MAX_LISTED} more` : shown;
}

function orderAndDeduplicate(times: number[], values: number[], fileRows: number[], warnings: string[]): TraceSeries {
  const order = times.map((_, i) => i);
  let sorted = true;
  for (let i = 1; i < times.length; i++) if (times[i]! < times[i - 1]!) sorted = false;
  if (!sorted) {
    order.sort((a, b) => times[a]! - times[b]! || a - b); // stable: file order breaks ties
    warnings.push("rows were not in time order and have been sorted by timestamp");
  }
  const t: number[] = [];
  const v: number[] = [];
  const exact: number[] = [];
  const conflicting: number[] = [];
  for (const i of order) {
    const last = t.length - 1;
    if (last >= 0 && t[last] === times[i]) {
      const same = Object.is(v[last], values[i]) || v[last] === values[i];
      (same ? exact : conflicting).push(fileRows[i]!);
      continue;
    }
    t.push(times[i]!);
    v.push(values[i]!);
  }
  if (exact.length) warnings.push(`${exact.length} exact duplicate row(s) dropped (rows ${listRows(exact)})`);
  if (conflicting.length) {
    warnings.push(
      `${conflicting.length} row(s) repeat an earlier timestamp with a different reading; the first reading in file order was kept (rows ${listRows(conflicting)})`,
    );
  }
  return { t_s: Float64Array.from(t), air_C: Float64Array.from(v) };
}

/** Leading and trailing missing readings cannot be bridged; they are removed, with a warning. */
function trimMissingEnds(series: TraceSeries, warnings: string[]): void {
  let a = 0;
  let b = series.t_s.length;
  while (a < b && Number.isNaN(series.air_C[a]!)) a++;
  while (b > a && Number.isNaN(series.air_C[b - 1]!)) b--;
  if (a === 0 && b === series.t_s.length) return;
  const removed = a + (series.t_s.length - b);
  warnings.push(`${removed} sample(s) without a valid reading at the start or end of the trace were left out`);
  series.t_s = series.t_s.slice(a, b);
  series.air_C = series.air_C.slice(a, b);
}
