import Papa from "papaparse";
import { decodeText } from "./decode";
import { forEachRow } from "./rows";
import { TraceImportError } from "./errors";
import { DELIMITERS, type ImportOptions, type ResolvedImportSettings } from "./settings";
import { DEFAULT_GAP_MULTIPLE, findGaps, type Gap, type TraceSeries } from "./series";
import { isoWallMs, parseTimeOfDay_s, parseWallClock, slashDateParts, wallAsUtcMs, YEAR_RANGE, ZoneResolver, type DateOrder } from "./timestamps";
import { detectDecimal, isMissingToken, parseReading, plainReading, toCelsius, unitFromHeader, type TemperatureUnit } from "./values";

/** Readings outside this range are flagged and excluded, never clipped (common-practice default, °C). */
export const PLAUSIBLE_RANGE_C = { min: -60, max: 80 } as const;

export interface ImportedChannel {
  name: string;
  role: "air" | "product" | "ignore";
  unit: TemperatureUnit;
}

export interface TraceImport {
  series: TraceSeries;
  settings: ResolvedImportSettings;
  channels: ImportedChannel[];
  gaps: Gap[];
  warnings: string[];
  /** the header, the first rows as written and the metadata lines above and below the data, for a preview */
  preview: { header: string[]; rows: string[][]; metadata: MetadataLine[] };
}

type Delimiter = (typeof DELIMITERS)[number];
const MAX_LISTED = 5;
/**
 * Repeated timestamps a file may hold beyond its distinct ones. An export appended to itself once
 * doubles every row and is still read (with a warning); millions of copies of a few samples (a stuck
 * clock, or a crafted file: 5 million rows for a 2-sample trace) are refused, so the work and memory
 * of an import stay in proportion to the trace it yields.
 */
export const DUPLICATE_ROWS_ALLOWED = 1000;
const HEAD_BYTES = 1 << 20;
const TIME_HEADER = /time|date|stamp|zeit|heure|hora|datum|elapsed|epoch|unix/i;
const PRODUCT_HEADER = /product|produkt|produit|producto|probe|core|simulant|food|sample|item/i;
const AIR_HEADER = /air|ambient|amb\b|room|reefer|temp|°|deg/i;

const fail = (message: string, row?: number, column?: string): never => {
  throw new TraceImportError(message, row, column);
};

/** A cell as quoted in a message: control characters made visible, long text cut. */
function show(cell: string): string {
  const visible = cell.replace(/[\u0000-\u001f\u007f]/g, (c) => (c === "\n" ? "\\n" : c === "\r" ? "\\r" : c === "\t" ? "\\t" : `\\u${c.charCodeAt(0).toString(16).padStart(4, "0")}`));
  return visible.length > 40 ? `${visible.slice(0, 40)}…` : visible;
}

function detectDelimiter(head: string): Delimiter {
  // The delimiter that splits the most lines into the same number (>1) of fields.
  const lines = head.split(/\r?\n/, 200).filter((l) => l.trim() !== "");
  let best: Delimiter = ",";
  let bestScore = 0;
  for (const d of DELIMITERS) {
    const counts = new Map<number, number>();
    for (const l of lines) {
      const n = l.split(d).length;
      if (n > 1) counts.set(n, (counts.get(n) ?? 0) + 1);
    }
    const score = Math.max(0, ...counts.values());
    if (score > bestScore) [best, bestScore] = [d, score];
  }
  return best;
}

const numberish = (c: string) => /^[+-]?[\d.,]+\s*(°?\s*[CFK])?$/i.test(c.trim()) && /\d/.test(c);
const timeish = (c: string) => parseWallClock(c, "dmy") !== null || parseWallClock(c, "mdy") !== null || !Number.isNaN(parseTimeOfDay_s(c));

const blank = (row: string[]) => row.every((c) => c.trim() === "");
/**
 * A row that reads as data: a time-like cell (or a number: Unix or elapsed time) and, beside it, at
 * least one reading: a cell that starts like a number, or a missing code. Other cells may hold text
 * (an event or alarm column). "Start;28.03.2026 23:00" is not data ("Start" is a word), nor is
 * "Logger serial;A1234". A reading that starts like a number but is unreadable ("3.1\u0007") still
 * counts, so that it is reported by row later.
 */
const looksLikeData = (row: string[]) => {
  let t = row.findIndex(timeish);
  if (t < 0) t = row.findIndex(numberish); // Unix or elapsed time
  if (t < 0) return false;
  return row.some((c, j) => j !== t && ((/^\s*[+-]?\.?\d/.test(c) && !timeish(c)) || isMissingToken(c, NO_CODES)));
};
const NO_CODES = new Set<string>();
/** Rows after a header candidate that must agree with it before it is taken as the header. */
const STABLE_ROWS = 5;

/**
 * Index of the header: the first row of names (two or more cells, none a number or a time) after
 * which the rows keep its number of fields and read as data (a time plus a number). Logger exports put
 * `key;value` metadata above the header with the same delimiter ("Logger serial;A1234",
 * "Start;28.03.2026 23:00"): such a line is not a header, because the lines after it are not data.
 * Up to STABLE_ROWS following rows are checked, up to the first blank line or change of field count:
 * the first must read as data, and at least half of them.
 */
function findHeaderRow(rows: string[][]): number {
  for (let i = 0; i + 1 < rows.length && i < 500; i++) {
    const head = rows[i]!;
    if (head.length < 2 || blank(head)) continue;
    if (head.some((c) => c.trim() !== "" && (numberish(c) || timeish(c)))) continue;
    const run: string[][] = [];
    for (let j = i + 1; j < rows.length && run.length < STABLE_ROWS; j++) {
      const r = rows[j]!;
      if (blank(r) || r.length !== head.length) break;
      run.push(r);
    }
    // the first row must be data, and most of the run: a bad cell further down is reported by row later
    if (run.length > 0 && looksLikeData(run[0]!) && run.filter(looksLikeData).length * 2 >= run.length) return i;
  }
  return fail("no header row was found: expected a row of column names followed by rows with a time and a temperature");
}

/** A metadata line ("Logger serial;A1234", "Start time: 2026-03-02 06:00") as a key and a value. */
export interface MetadataLine {
  /** 1-based line of the file */
  row: number;
  /** empty for a line without a key (a title) */
  key: string;
  value: string;
}

/**
 * Key and value of a metadata line: "Key: value" (or "Key = value") within the first cell, else the
 * first cell is the key and the other cells, joined by the file's delimiter, the value. A line of one
 * cell without a colon (a title) has an empty key.
 */
function metadataOf(row: string[], rowNo: number, delimiter: string): MetadataLine | null {
  const cells = row.map((c) => c.trim());
  while (cells.length > 0 && cells[cells.length - 1] === "") cells.pop();
  if (cells.every((c) => c === "")) return null;
  const join = delimiter === "\t" ? ", " : `${delimiter} `;
  const m = /^([^:=]{1,60}?)\s*[:=]\s*(.*)$/.exec(cells[0]!);
  if (m) return { row: rowNo, key: m[1]!.trim(), value: [m[2]!.trim(), ...cells.slice(1)].filter((c) => c !== "").join(join) };
  if (cells.length === 1) return { row: rowNo, key: "", value: cells[0]! };
  return { row: rowNo, key: cells[0]!, value: cells.slice(1).filter((c) => c !== "").join(join) };
}

/** A line that can be footer metadata: its first non-blank cell is a label (letters), not a time or a number. */
function isMetadataLine(row: string[]): boolean {
  const first = row.find((c) => c.trim() !== "");
  return first !== undefined && /\p{L}/u.test(first) && !timeish(first) && !numberish(first);
}

function columnIndex(header: string[], name: string, what: string): number {
  const i = header.findIndex((h) => h === name);
  if (i < 0) fail(`there is no ${what} column named '${name}' (columns: ${header.map((h) => `'${h}'`).join(", ")})`);
  return i;
}

function listRows(rows: number[], count = rows.length): string {
  const shown = rows.slice(0, MAX_LISTED).join(", ");
  return count > MAX_LISTED ? `${shown}, and ${count - MAX_LISTED} more` : shown;
}

/** The MAX_LISTED smallest row numbers of both lists, in order (one pass: the lists can hold millions). */
function firstRows(a: readonly number[], b: readonly number[]): number[] {
  const out: number[] = [];
  for (const list of [a, b]) {
    for (const r of list) {
      if (out.length === MAX_LISTED && r >= out[MAX_LISTED - 1]!) continue;
      out.push(r);
      out.sort((x, y) => x - y);
      if (out.length > MAX_LISTED) out.pop();
    }
  }
  return out;
}

/** Start time written in the metadata lines above the header ("Start time: 2026-03-01 08:00"), if any. */
function startFromMetadata(rows: string[][], headerIdx: number): string | undefined {
  for (let i = 0; i < headerIdx; i++) {
    const line = rows[i]!.join(" ");
    if (!/start/i.test(line)) continue;
    const m = /(\d{4}-\d{2}-\d{2}[T ]\d{1,2}:\d{2}(?::\d{2})?(?:Z|[+-]\d{2}:?\d{2})?)/.exec(line);
    if (m) return m[1];
  }
  return undefined;
}

function elapsedUnit(header: string): "elapsed-s" | "elapsed-min" | "elapsed-h" | undefined {
  const h = header.toLowerCase();
  if (/\b(min|mins|minutes)\b/.test(h)) return "elapsed-min";
  if (/\b(h|hr|hrs|hours)\b/.test(h)) return "elapsed-h";
  if (/\b(s|sec|secs|seconds)\b/.test(h)) return "elapsed-s";
  return undefined;
}

interface Plan {
  settings: ResolvedImportSettings;
  headerIdx: number;
  header: string[];
  timeIdx: number;
  dateIdx: number;
  airIdx: number;
  productIdx: number;
  channels: ImportedChannel[];
  /** an elapsed-time start found in the header lines without a UTC offset (read in the import's zone) */
  startWithoutOffset?: string;
}

/** Works out every setting not given, from the first megabyte of the file. */
function plan(headRows: string[][], options: ImportOptions, encoding: ResolvedImportSettings["encoding"], delimiter: Delimiter): Plan {
  const headerIdx = options.headerRow !== undefined ? options.headerRow - 1 : findHeaderRow(headRows);
  if (headerIdx >= headRows.length) fail(`row ${headerIdx + 1} (the header row given) is past the end of the file`);
  const header = headRows[headerIdx]!.map((h) => h.trim());
  // detection looks at data rows only: footer metadata with the header's field count would skew it
  const rowsAfter = headRows.slice(headerIdx + 1).filter((r) => r.length === header.length);
  const dataRows = rowsAfter.filter(looksLikeData);
  const sample = (dataRows.length > 0 ? dataRows : rowsAfter).slice(0, 20000);
  if (sample.length === 0) fail("the file has a header but no data rows");
  const col = (i: number) => sample.map((r) => r[i]!);
  const ignored = new Set(options.ignoreColumns ?? []);

  // Time: a date-time column, or a date column plus a time-of-day column, or numbers (Unix or elapsed).
  let timeIdx: number;
  let dateIdx = -1;
  const candidates = header.map((_, i) => i).filter((i) => !ignored.has(header[i]!));
  const hasClock = (c: string) => /\d:\d\d/.test(c);
  const isDateTime = (i: number) => col(i).some((c) => hasClock(c) && (parseWallClock(c, "dmy") !== null || parseWallClock(c, "mdy") !== null));
  const isDateOnly = (i: number) => col(i).some((c) => !hasClock(c) && (parseWallClock(c, "dmy") !== null || parseWallClock(c, "mdy") !== null));
  const isClockOnly = (i: number) => col(i).every((c) => c.trim() === "" || !Number.isNaN(parseTimeOfDay_s(c))) && col(i).some((c) => c.trim() !== "");
  if (options.dateColumn !== undefined) dateIdx = columnIndex(header, options.dateColumn, "date");
  if (options.timeColumn !== undefined) timeIdx = columnIndex(header, options.timeColumn, "time");
  else {
    const dt = candidates.filter((i) => i !== dateIdx && isDateTime(i));
    const clock = candidates.filter((i) => i !== dateIdx && isClockOnly(i));
    const dateOnly = candidates.filter((i) => isDateOnly(i));
    if (dt.length > 0) timeIdx = dt.find((i) => TIME_HEADER.test(header[i]!)) ?? dt[0]!;
    else if (clock.length > 0 && (dateIdx >= 0 || dateOnly.length > 0)) {
      timeIdx = clock[0]!;
      if (dateIdx < 0) dateIdx = dateOnly[0]!;
    } else {
      timeIdx =
        candidates.find((i) => i !== dateIdx && TIME_HEADER.test(header[i]!)) ??
        candidates.find((i) => i !== dateIdx && col(i).every((c) => /^\d{9,13}(\.\d+)?$/.test(c.trim()))) ??
        fail("no time column was found; name it with the time-column setting");
    }
  }
  if (dateIdx < 0 && options.dateColumn === undefined && isClockOnly(timeIdx)) {
    dateIdx = candidates.find((i) => i !== timeIdx && isDateOnly(i)) ?? fail(`column '${header[timeIdx]}' holds clock times only; give the date column`);
  }
  const timeCells = col(timeIdx);
  let timeFormat = options.timeFormat;
  if (!timeFormat) {
    if (dateIdx >= 0 || timeCells.some(timeish)) timeFormat = "datetime";
    else {
      const nums = timeCells.map((c) => Number(c.trim())).filter(Number.isFinite);
      const first = nums[0] ?? Number.NaN;
      const unit = elapsedUnit(header[timeIdx]!);
      if (/elapsed|since|from start/i.test(header[timeIdx]!) || unit) timeFormat = unit ?? "elapsed-s";
      else if (first >= 1e8 && first < 1e11) timeFormat = "unix-s";
      else if (first >= 1e11 && first < 1e14) timeFormat = "unix-ms";
      else timeFormat = fail(`column '${header[timeIdx]}': '${timeCells[0]}' is neither a date-time nor a Unix time; choose the time format`);
    }
  }
  let startTime = options.startTime;
  let startWithoutOffset: string | undefined;
  if (timeFormat.startsWith("elapsed") && !startTime) {
    const found = startFromMetadata(headRows, headerIdx) ?? fail(`column '${header[timeIdx]}' holds elapsed times: give the start time (ISO 8601 with an offset)`);
    // A start written without an offset is read in the import's time zone, then kept as UTC.
    const wall = parseWallClock(found, "ymd");
    if (!wall) fail(`the start time '${found}' in the file's header lines is not a date and time`);
    startTime = new Date(new ZoneResolver(options.timeZone ?? "UTC").toEpochMs(wall!, -Infinity)).toISOString();
    if (wall!.offsetMin === undefined) startWithoutOffset = found;
  }

  // Day-first or month-first, from dates such as 13/04 or 04/13 in the data.
  let dateOrder: DateOrder | undefined = options.dateOrder;
  if (!dateOrder) {
    const dateCells = dateIdx >= 0 ? col(dateIdx) : timeCells;
    let dayFirst = false, monthFirst = false, slashDates = false;
    for (const c of dateCells) {
      const p = slashDateParts(c);
      if (!p) continue;
      slashDates = true;
      if (p[0] > 12) dayFirst = true;
      if (p[1] > 12) monthFirst = true;
    }
    if (dayFirst && monthFirst) fail(`column '${header[dateIdx >= 0 ? dateIdx : timeIdx]}': the dates fit neither day-first nor month-first throughout`);
    if (slashDates && !dayFirst && !monthFirst) {
      fail(`column '${header[dateIdx >= 0 ? dateIdx : timeIdx]}': dates such as '${dateCells.find((c) => slashDateParts(c))}' could be day-first or month-first; choose the date order (dmy or mdy)`);
    }
    dateOrder = dayFirst ? "dmy" : monthFirst ? "mdy" : "ymd";
  }

  // Temperature channels: the other columns that hold numbers (at least 80 % of their non-blank cells).
  // With no column of numbers, the best-named remaining column is read, so its first bad cell is reported.
  const others = candidates.filter((i) => i !== timeIdx && i !== dateIdx);
  const numericCols = others.filter((i) => {
    const cells = col(i).filter((c) => c.trim() !== "");
    return cells.length > 0 && cells.filter(numberish).length >= 0.8 * cells.length;
  });
  const airIdx =
    options.airColumn !== undefined
      ? columnIndex(header, options.airColumn, "air-temperature")
      : numericCols.find((i) => AIR_HEADER.test(header[i]!) && !PRODUCT_HEADER.test(header[i]!)) ??
        numericCols.find((i) => !PRODUCT_HEADER.test(header[i]!)) ??
        numericCols[0] ??
        others.find((i) => AIR_HEADER.test(header[i]!)) ??
        others[0] ??
        fail("no temperature column was found");
  const productIdx =
    options.productColumn !== undefined
      ? columnIndex(header, options.productColumn, "product")
      : numericCols.find((i) => i !== airIdx && PRODUCT_HEADER.test(header[i]!)) ?? -1;
  if (productIdx === airIdx) fail(`column '${header[airIdx]}' cannot be both the air and the product channel`);

  const decimal = options.decimal ?? detectDecimal([...(airIdx >= 0 ? col(airIdx) : []), ...(productIdx >= 0 ? col(productIdx) : [])]);
  if (decimal === "," && delimiter === "," ) fail("a comma cannot be both the delimiter and the decimal separator");
  const unitOf = (i: number): TemperatureUnit => options.unit ?? unitFromHeader(header[i]!) ?? "C";
  const channels: ImportedChannel[] = numericCols.map((i) => ({ name: header[i]!, role: i === airIdx ? "air" : i === productIdx ? "product" : "ignore", unit: unitOf(i) }));
  if (!numericCols.includes(airIdx)) channels.unshift({ name: header[airIdx]!, role: "air", unit: unitOf(airIdx) });
  if (productIdx >= 0 && !numericCols.includes(productIdx)) channels.push({ name: header[productIdx]!, role: "product", unit: unitOf(productIdx) });

  const plausibleMin_C = options.plausibleMin_C ?? PLAUSIBLE_RANGE_C.min, plausibleMax_C = options.plausibleMax_C ?? PLAUSIBLE_RANGE_C.max;
  if (!(plausibleMin_C < plausibleMax_C)) fail(`the plausible minimum (${plausibleMin_C} °C) must be below the plausible maximum (${plausibleMax_C} °C)`);
  const settings: ResolvedImportSettings = {
    parser: "corelag-csv-2",
    encoding,
    delimiter,
    headerRow: headerIdx + 1,
    timeColumn: header[timeIdx]!,
    ...(dateIdx >= 0 ? { dateColumn: header[dateIdx]! } : {}),
    timeFormat,
    dateOrder,
    timeZone: options.timeZone ?? "UTC",
    ...(startTime ? { startTime } : {}),
    airColumn: header[airIdx]!,
    ...(productIdx >= 0 ? { productColumn: header[productIdx]!, productUnit: unitOf(productIdx) } : {}),
    ignoreColumns: [...ignored],
    airUnit: unitOf(airIdx),
    ...(options.unit ? { unit: options.unit } : {}),
    decimal,
    missing: options.missing ?? [],
    plausibleMin_C,
    plausibleMax_C,
    gapMultiple: options.gapMultiple ?? DEFAULT_GAP_MULTIPLE,
  };
  return { settings, headerIdx, header, timeIdx, dateIdx, airIdx, productIdx, channels, ...(startWithoutOffset ? { startWithoutOffset } : {}) };
}

/**
 * Reads a delimited logger export. Settings not given are detected; the resolved settings come back
 * with the series so the same import can be repeated exactly. The whole file is refused on the first
 * unreadable cell, naming row (1-based, as in the file) and column. Out-of-order rows are sorted and
 * exact duplicates dropped, each with a warning; for a conflicting duplicate (same time, other
 * readings) the first in file order is kept, with a warning. Missing readings stay NaN (gaps).
 */
export function importCsv(bytes: Uint8Array, options: ImportOptions = {}, onProgress?: (fraction: number) => void): TraceImport {
  const { text, encoding } = decodeText(bytes, options.encoding);
  if (text.trim() === "") fail("the file holds no text");
  let head = text.length > HEAD_BYTES ? text.slice(0, HEAD_BYTES) : text;
  if (head.length < text.length) head = head.slice(0, Math.max(head.lastIndexOf("\n"), 0));
  const delimiter = options.delimiter ?? detectDelimiter(head);
  const headRows = Papa.parse<string[]>(head, { delimiter, skipEmptyLines: false }).data;
  const p = plan(headRows, options, encoding, delimiter);
  const s = p.settings;
  const metadata: MetadataLine[] = [];
  for (let i = 0; i < p.headerIdx; i++) {
    const m = metadataOf(headRows[i]!, i + 1, delimiter);
    if (m) metadata.push(m);
  }
  const extraMissing = new Set(s.missing);
  /** cells in the PLAIN layout can be read without missing-code, suffix or separator handling */
  const plainCells = s.decimal === "." && extraMissing.size === 0;
  const zone = new ZoneResolver(s.timeZone);
  const startMs = s.startTime ? Date.parse(s.startTime) : Number.NaN;
  const elapsedScale = s.timeFormat === "elapsed-min" ? 60_000 : s.timeFormat === "elapsed-h" ? 3_600_000 : 1000;
  const cols: Array<{ idx: number; name: string; unit: TemperatureUnit; suffix?: TemperatureUnit }> = [{ idx: p.airIdx, name: s.airColumn, unit: s.airUnit }];
  if (p.productIdx >= 0) cols.push({ idx: p.productIdx, name: s.productColumn!, unit: s.productUnit! });

  let times = new Float64Array(1024);
  let vals = new Float64Array(1024 * cols.length);
  let rowsOf = new Int32Array(1024);
  let n = 0;
  const implausible: number[] = [];
  let prevMs = -Infinity;
  let rowNo = 0;
  /** rows whose time carried no UTC offset (read in s.timeZone) */
  let withoutOffset = 0;
  /** a blank line since the last data row: the lines after it may be a footer */
  let afterBlank = false;
  /** first line of the footer (metadata after the data), once one has begun */
  let footerFrom = 0;
  const headerLen = p.header.length;
  const total = text.length;
  const preview: string[][] = [];

  /**
   * Lines after the data can be footer metadata ("Samples;48", "End;29.03.2026 11:00"): a line that
   * is not data and whose first cell is a label begins the footer when it follows a blank line or has
   * another number of fields than the header; every line after it must be metadata too. A line that
   * begins with a time, or a label line straight after data with the header's field count, is still
   * refused as a bad data row.
   */
  const handle = (row: string[], cursor: number) => {
    rowNo++;
    if (rowNo <= p.headerIdx + 1) return;
    if (blank(row)) {
      afterBlank = n > 0;
      return;
    }
    if (footerFrom > 0) {
      if (!isMetadataLine(row)) fail(`row ${rowNo}: a data row after the footer lines that begin on row ${footerFrom}; a file must hold one table`, rowNo);
      metadata.push(metadataOf(row, rowNo, delimiter)!);
      return;
    }
    if (n > 0 && (afterBlank || row.length !== headerLen) && isMetadataLine(row)) {
      try {
        readRow(row, cursor);
      } catch (e) {
        if (!(e instanceof TraceImportError)) throw e;
        footerFrom = rowNo;
        metadata.push(metadataOf(row, rowNo, delimiter)!);
      }
      return;
    }
    readRow(row, cursor);
  };

  const readRow = (row: string[], cursor: number) => {
    if (row.length !== headerLen) fail(`row ${rowNo}: expected ${headerLen} fields but found ${row.length}`, rowNo);
    afterBlank = false;
    // time
    const tText = row[p.timeIdx]!;
    let ms: number;
    let wallMs: number;
    if (s.timeFormat === "datetime") {
      if (p.dateIdx >= 0) {
        const dText = row[p.dateIdx]!;
        const d = parseWallClock(dText, s.dateOrder);
        if (!d || d.h !== 0 || d.mi !== 0 || d.s !== 0) fail(`row ${rowNo}, column '${s.dateColumn}': '${show(dText)}' is not a date`, rowNo, s.dateColumn);
        if (d!.y < YEAR_RANGE.min || d!.y > YEAR_RANGE.max) fail(`row ${rowNo}, column '${s.dateColumn}': '${show(dText)}' is outside the years ${YEAR_RANGE.min}–${YEAR_RANGE.max}; was the logger's clock set?`, rowNo, s.dateColumn);
        const sod = parseTimeOfDay_s(tText);
        if (Number.isNaN(sod)) fail(`row ${rowNo}, column '${s.timeColumn}': '${show(tText)}' is not a time of day`, rowNo, s.timeColumn);
        wallMs = wallAsUtcMs(d!) + sod * 1000;
        const w = new Date(wallMs);
        withoutOffset++;
        ms = zone.toEpochMs({ y: w.getUTCFullYear(), mo: w.getUTCMonth() + 1, d: w.getUTCDate(), h: w.getUTCHours(), mi: w.getUTCMinutes(), s: w.getUTCSeconds(), ms: w.getUTCMilliseconds() }, prevMs);
      } else if ((wallMs = isoWallMs(tText)) === wallMs) {
        // the common layout, read without building a WallClock (same instant as the general path below)
        const utc = tText.charCodeAt(tText.length - 1) === 90;
        if (!utc) withoutOffset++;
        ms = zone.wallToEpochMs(wallMs, utc ? 0 : undefined, prevMs);
      } else {
        const w = parseWallClock(tText, s.dateOrder);
        if (!w) fail(`row ${rowNo}, column '${s.timeColumn}': '${show(tText)}' is not a date and time`, rowNo, s.timeColumn);
        if (w!.y < YEAR_RANGE.min || w!.y > YEAR_RANGE.max) {
          fail(`row ${rowNo}, column '${s.timeColumn}': '${show(tText)}' is outside the years ${YEAR_RANGE.min}–${YEAR_RANGE.max}; was the logger's clock set?`, rowNo, s.timeColumn);
        }
        ms = zone.toEpochMs(w!, prevMs);
        if (w!.offsetMin === undefined) withoutOffset++;
      }
    } else {
      const x = Number(tText.trim());
      if (tText.trim() === "" || !Number.isFinite(x)) fail(`row ${rowNo}, column '${s.timeColumn}': '${show(tText)}' is not a number of ${s.timeFormat.replace("elapsed-", "").replace("unix-", "")}`, rowNo, s.timeColumn);
      ms = s.timeFormat === "unix-s" ? x * 1000 : s.timeFormat === "unix-ms" ? x : startMs + x * elapsedScale;
    }
    prevMs = ms;
    // readings
    if (n === times.length) {
      // grow the typed arrays by doubling: amortised O(1) per row, no per-row objects
      const t2 = new Float64Array(times.length * 2);
      t2.set(times);
      times = t2;
      const r2 = new Int32Array(rowsOf.length * 2);
      r2.set(rowsOf);
      rowsOf = r2;
      const v2 = new Float64Array(vals.length * 2);
      v2.set(vals);
      vals = v2;
    }
    for (let c = 0; c < cols.length; c++) {
      const ch = cols[c]!;
      const cell = row[ch.idx]!;
      let v = Number.NaN;
      const quick = plainCells ? plainReading(cell) : Number.NaN;
      if (quick === quick) {
        // the common plain cell ("4.25"): no missing-code, suffix or separator handling needed
        v = toCelsius(quick, ch.unit);
        if (v < s.plausibleMin_C || v > s.plausibleMax_C) {
          implausible.push(rowNo);
          v = Number.NaN;
        }
      } else if (!isMissingToken(cell, extraMissing)) {
        const r = parseReading(cell, s.decimal);
        if (!Number.isFinite(r.value)) fail(`row ${rowNo}, column '${ch.name}': '${show(cell)}' is not a number`, rowNo, ch.name);
        if (r.suffix) {
          if (ch.suffix === undefined) ch.suffix = r.suffix;
          if (r.suffix !== ch.suffix || (unitFromHeader(ch.name) !== undefined && r.suffix !== ch.unit)) {
            fail(`row ${rowNo}, column '${ch.name}': '${show(cell)}' is in °${r.suffix}, but the column is in °${ch.suffix === r.suffix ? ch.unit : ch.suffix}`, rowNo, ch.name);
          }
        }
        if (extraMissing.has(String(r.value))) v = Number.NaN;
        else {
          v = toCelsius(r.value, r.suffix ?? ch.unit);
          if (v < s.plausibleMin_C || v > s.plausibleMax_C) {
            implausible.push(rowNo);
            v = Number.NaN;
          }
        }
      }
      vals[n * cols.length + c] = v;
    }
    times[n] = ms / 1000;
    rowsOf[n] = rowNo;
    n++;
    if (preview.length < 20) preview.push(row);
    if (onProgress && (n & 0xffff) === 0) onProgress(cursor / total);
  };

  forEachRow(text, delimiter, (row, cursor, problem) => {
    if (problem !== undefined) fail(`row ${rowNo + 1}: ${problem.toLowerCase()} (a quote opened but not closed?)`, rowNo + 1);
    handle(row, cursor);
  });
  onProgress?.(1);
  if (n < 2) fail("the file has fewer than two data rows");

  const warnings: string[] = [];
  if (options.timeZone === undefined && (withoutOffset > 0 || p.startWithoutOffset)) {
    const what = p.startWithoutOffset ? `the start time '${p.startWithoutOffset}'` : withoutOffset === n ? "the times" : `${withoutOffset} of ${n} rows' times`;
    const [verb, it] = p.startWithoutOffset ? ["carries", "it was"] : ["carry", "they were"];
    warnings.push(`${what} ${verb} no UTC offset and no time zone was chosen, so ${it} read as UTC; if the logger kept local time, choose its time zone`);
  }
  if (implausible.length > 0) {
    warnings.push(`${implausible.length} reading(s) outside ${s.plausibleMin_C} to ${s.plausibleMax_C} °C were excluded as implausible (rows ${listRows(implausible)})`);
  }
  if (zone.ambiguous > 0) warnings.push(`${zone.ambiguous} row(s) fell in the repeated hour of a daylight-saving change in ${s.timeZone}; they were placed in time by their order in the file`);
  if (zone.skipped > 0) warnings.push(`${zone.skipped} row(s) have local times that do not exist in ${s.timeZone} (the skipped hour of a daylight-saving change); they were read with the offset in force before the change`);
  const series = orderAndDeduplicate(times.subarray(0, n), vals.subarray(0, n * cols.length), cols.length, rowsOf.subarray(0, n), warnings);
  trimMissingEnds(series, warnings);
  if (series.t_s.length < 2) fail("fewer than two valid air readings remain after import");
  const gaps = findGaps(series, s.gapMultiple);
  if (gaps.length > 0) warnings.push(`${gaps.length} gap(s) in the air readings (missing values, or pauses over ${s.gapMultiple} median intervals); the models bridge them linearly and rules across them are at best inconclusive`);
  if (metadata.length > 0) s.metadata = metadata;
  return { series, settings: s, channels: p.channels, gaps, warnings, preview: { header: p.header, rows: preview, metadata } };
}

function orderAndDeduplicate(times: Float64Array, vals: Float64Array, k: number, rows: Int32Array, warnings: string[]): TraceSeries {
  const n = times.length;
  let sorted = true;
  for (let i = 1; i < n; i++) if (times[i]! < times[i - 1]!) { sorted = false; break; }
  let order: Int32Array | null = null;
  if (!sorted) {
    order = Int32Array.from({ length: n }, (_, i) => i).sort((a, b) => times[a]! - times[b]! || a - b); // stable: file order breaks ties
    warnings.push("rows were not in time order and have been sorted by timestamp");
  }
  const t = new Float64Array(n);
  const v = new Float64Array(n * k);
  const exact: number[] = [];
  const conflicting: number[] = [];
  let m = 0;
  const same = (a: number, b: number) => a === b || (Number.isNaN(a) && Number.isNaN(b));
  for (let j = 0; j < n; j++) {
    const i = order ? order[j]! : j;
    if (m > 0 && t[m - 1] === times[i]) {
      let eq = true;
      for (let c = 0; c < k; c++) if (!same(v[(m - 1) * k + c]!, vals[i * k + c]!)) eq = false;
      (eq ? exact : conflicting).push(rows[i]!);
      continue;
    }
    t[m] = times[i]!;
    for (let c = 0; c < k; c++) v[m * k + c] = vals[i * k + c]!;
    m++;
  }
  const repeated = exact.length + conflicting.length;
  if (repeated > Math.max(DUPLICATE_ROWS_ALLOWED, m)) {
    fail(
      `${repeated} rows repeat a timestamp already read (rows ${listRows(firstRows(exact, conflicting), repeated)}), more than the ${m} distinct sample(s) the file holds: ` +
        `a file may repeat at most as many rows as it has distinct timestamps, or ${DUPLICATE_ROWS_ALLOWED}; check the export (was it appended to itself, or is the logger's clock stuck?)`,
    );
  }
  if (exact.length) warnings.push(`${exact.length} exact duplicate row(s) dropped (rows ${listRows(exact)})`);
  if (conflicting.length) {
    warnings.push(`${conflicting.length} row(s) repeat an earlier timestamp with different readings; the first reading in file order was kept (rows ${listRows(conflicting)})`);
  }
  const channel = (c: number) => {
    // a plain loop: Float64Array.from with a mapping function is about ten times slower on a million rows
    const out = new Float64Array(m);
    for (let i = 0; i < m; i++) out[i] = v[i * k + c]!;
    return out;
  };
  return { t_s: t.slice(0, m), air_C: channel(0), ...(k > 1 ? { probe_C: channel(1) } : {}) };
}

/** Leading and trailing samples without an air reading cannot be bridged; they are left out, with a warning. */
function trimMissingEnds(series: TraceSeries, warnings: string[]): void {
  let a = 0;
  let b = series.t_s.length;
  while (a < b && Number.isNaN(series.air_C[a]!)) a++;
  while (b > a && Number.isNaN(series.air_C[b - 1]!)) b--;
  if (a === 0 && b === series.t_s.length) return;
  warnings.push(`${a + (series.t_s.length - b)} sample(s) without an air reading at the start or end of the trace were left out`);
  series.t_s = series.t_s.slice(a, b);
  series.air_C = series.air_C.slice(a, b);
  if (series.probe_C) series.probe_C = series.probe_C.slice(a, b);
}
