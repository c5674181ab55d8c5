import { DateTime } from "luxon";

/** Tokens that loggers write for "no reading". They become gaps (NaN), never zeros. */
const MISSING = new Set(["", "na", "n/a", "nan", "-", "--", "null"]);

export function isMissingToken(text: string): boolean {
  return MISSING.has(text.trim().toLowerCase());
}

const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/** Strict decimal number (point as decimal separator); NaN when the text is not exactly a number. */
export function parseStrictNumber(text: string): number {
  const s = text.trim();
  return NUMBER.test(s) ? Number(s) : Number.NaN;
}

/**
 * A timestamp to epoch seconds. ISO 8601 with an offset or Z keeps its offset; a local date-time
 * ("2026-03-14T08:00:00" or "2026-03-14 08:00:00") is read in `zone` by luxon, which resolves the
 * daylight-saving changes. NaN when the text is not a timestamp.
 */
export function parseTimestamp_s(text: string, zone: string): number {
  const s = text.trim();
  if (s === "") return Number.NaN;
  let dt = DateTime.fromISO(s, { zone });
  if (!dt.isValid) dt = DateTime.fromSQL(s, { zone });
  return dt.isValid ? dt.toMillis() / 1000 : Number.NaN;
}

export type TemperatureUnit = "C" | "F" | "K";

/** Unit written in a column header, e.g. "Temp (°F)", "Air [K]", "temp_degC"; undefined when none. */
export function unitFromHeader(header: string): TemperatureUnit | undefined {
  const h = header.toLowerCase();
  if (/°\s*f\b|\(f\)|\[f\]|degf\b|fahrenheit/.test(h)) return "F";
  if (/°\s*c\b|\(c\)|\[c\]|degc\b|celsius/.test(h)) return "C";
  if (/\(k\)|\[k\]|kelvin/.test(h)) return "K";
  return undefined;
}

/** Converts a reading to °C (exact definitions: °F = °C·9/5 + 32, K = °C + 273.15). */
export function toCelsius(value: number, unit: TemperatureUnit): number {
  if (unit === "F") return ((value - 32) * 5) / 9;
  if (unit === "K") return value - 273.15;
  return value;
}
