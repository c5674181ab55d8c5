import { z } from "zod";
import { IANAZone } from "luxon";

const zone = z.string().refine((v) => IANAZone.isValidZone(v), { message: "is not a known IANA time zone (e.g. Europe/Berlin)" });
export const DELIMITERS = [",", ";", "\t", "|"] as const;
export const TIME_FORMATS = ["datetime", "unix-s", "unix-ms", "elapsed-s", "elapsed-min", "elapsed-h"] as const;

/**
 * Import settings as a user (form, CLI flag) gives them. Everything left out is detected from the file;
 * the import returns the *resolved* settings (every field filled), which are stored with the trace so
 * that importing the same bytes with them again yields the identical series.
 */
export const importOptionsSchema = z.object({
  /** sheet of an .xlsx workbook (the first when absent) */
  sheet: z.string().min(1).optional(),
  encoding: z.enum(["utf-8", "utf-16le", "utf-16be", "windows-1252"]).optional(),
  delimiter: z.enum(DELIMITERS, { error: "delimiter must be one of , ; tab |" }).optional(),
  /** 1-based row of the column names */
  headerRow: z.number().int().positive().optional(),
  /** the timestamp column; with dateColumn, the clock-time column */
  timeColumn: z.string().min(1).optional(),
  /** a separate date column */
  dateColumn: z.string().min(1).optional(),
  timeFormat: z.enum(TIME_FORMATS).optional(),
  dateOrder: z.enum(["ymd", "dmy", "mdy"], { error: "date order must be dmy, mdy or ymd" }).optional(),
  /** IANA zone for times written without an offset */
  timeZone: zone.optional(),
  /** start of an elapsed-time column, ISO 8601 with offset or Z */
  startTime: z.iso.datetime({ offset: true, message: "must be an ISO 8601 date-time with Z or an offset" }).optional(),
  airColumn: z.string().min(1).optional(),
  /** a product-probe (or product-simulant) channel */
  productColumn: z.string().min(1).optional(),
  /** columns to leave out (neither air nor product) */
  ignoreColumns: z.array(z.string()).max(200, { message: "at most 200 columns may be left out" }).optional(),
  /** unit of the temperature columns; detected from the headers when absent, else °C */
  unit: z.enum(["C", "F", "K"], { error: "unit must be C, F or K" }).optional(),
  decimal: z.enum([".", ","], { error: "decimal separator must be . or ," }).optional(),
  /** extra codes that mean "no reading", e.g. "-999" (blank, NA, N/A, NaN, -, -- always do) */
  missing: z.array(z.string().trim().min(1)).max(20, { message: "at most 20 missing-value codes are allowed" }).optional(),
  /** readings outside this range are flagged and excluded, °C (defaults −60 and +80) */
  plausibleMin_C: z.number().finite().optional(),
  plausibleMax_C: z.number().finite().optional(),
  /** a pause longer than this multiple of the median interval counts as a gap (default 3) */
  gapMultiple: z.number().finite().min(1.5, { message: "gap multiple must be at least 1.5" }).max(1000).optional(),
}).refine((o) => o.plausibleMin_C === undefined || o.plausibleMax_C === undefined || o.plausibleMin_C < o.plausibleMax_C, {
  path: ["plausibleMin_C"],
  error: (iss) => {
    const o = iss.input as { plausibleMin_C: number; plausibleMax_C: number };
    return `the plausible minimum (${o.plausibleMin_C} °C) must be below the plausible maximum (${o.plausibleMax_C} °C)`;
  },
});
export type ImportOptions = z.infer<typeof importOptionsSchema>;

/** The settings an import actually used: complete, stored beside the trace. */
export interface ResolvedImportSettings {
  parser: "corelag-csv-2";
  /** "xlsx" when the file was a workbook, read as comma-separated text of one sheet */
  source?: "xlsx";
  sheet?: string;
  encoding: "utf-8" | "utf-16le" | "utf-16be" | "windows-1252";
  delimiter: (typeof DELIMITERS)[number];
  headerRow: number;
  timeColumn: string;
  dateColumn?: string;
  timeFormat: (typeof TIME_FORMATS)[number];
  dateOrder: "ymd" | "dmy" | "mdy";
  timeZone: string;
  startTime?: string;
  airColumn: string;
  productColumn?: string;
  ignoreColumns: string[];
  airUnit: "C" | "F" | "K";
  productUnit?: "C" | "F" | "K";
  unit?: "C" | "F" | "K";
  decimal: "." | ",";
  missing: string[];
  plausibleMin_C: number;
  plausibleMax_C: number;
  gapMultiple: number;
  /** metadata lines above the header and below the data ("Logger serial" → "A1234"), with their line numbers */
  metadata?: Array<{ row: number; key: string; value: string }>;
}

/** Stored settings back into options: importing with them repeats the import exactly. */
export function optionsFromSettings(s: ResolvedImportSettings): ImportOptions {
  const { parser: _p, source: _s, metadata: _m, airUnit, productUnit, ...rest } = s;
  void _p;
  void _s;
  void _m;
  // each column's resolved unit is kept by passing the air unit as the shared unit when they agree
  return { ...rest, unit: s.unit ?? (productUnit === undefined || productUnit === airUnit ? airUnit : undefined) };
}
