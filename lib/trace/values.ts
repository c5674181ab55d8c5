/** Tokens that loggers write for "no reading". They become gaps (NaN), never zeros. */
const MISSING = new Set(["", "na", "n/a", "nan", "-", "--", "null", "none"]);

export function isMissingToken(text: string, extra: ReadonlySet<string>): boolean {
  const s = text.trim();
  return MISSING.has(s.toLowerCase()) || extra.has(s);
}

const POINT = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;
const POINT_THOUSANDS = /^[+-]?\d{1,3}(,\d{3})+(\.\d+)?$/;
const COMMA = /^[+-]?(\d+(,\d*)?|,\d+)$/;
const COMMA_THOUSANDS = /^[+-]?\d{1,3}(\.\d{3})+(,\d+)?$/;
const UNIT_SUFFIX = /\s*(°\s*[CFK]|deg\s*[CFK]|[CFK])$/i;

/**
 * A reading as a number, with "." or "," as the decimal separator and the other one allowed as a
 * thousands separator in groups of three. A unit suffix ("4.5 °C") is split off and returned.
 * NaN when the text is not exactly a number.
 */
const PLAIN = /^-?\d{1,4}\.\d{1,6}$/;

/**
 * The import's per-row fast path for a plain reading ("4.25", "-18.3": the PLAIN layout), NaN for
 * anything else. Digits are gathered as an integer below 2^53 and divided once by an exact power of
 * ten, so the result is the correctly rounded value of the decimal, the same double Number(text) gives
 * (Clinger's fast path: W. D. Clinger, "How to read floating point numbers accurately", PLDI 1990).
 */
export function plainReading(text: string): number {
  const n = text.length;
  let i = 0;
  const negative = n > 0 && text.charCodeAt(0) === 45;
  if (negative) i = 1;
  let whole = 0, intDigits = 0;
  for (; i < n; i++) {
    const c = text.charCodeAt(i) - 48;
    if (c < 0 || c > 9) break;
    whole = whole * 10 + c;
    intDigits++;
  }
  if (intDigits < 1 || intDigits > 4 || i >= n || text.charCodeAt(i) !== 46) return Number.NaN;
  const fracStart = ++i;
  let scale = 1;
  for (; i < n; i++) {
    const c = text.charCodeAt(i) - 48;
    if (c < 0 || c > 9) return Number.NaN;
    whole = whole * 10 + c;
    scale *= 10;
  }
  const fracDigits = n - fracStart;
  if (fracDigits < 1 || fracDigits > 6) return Number.NaN;
  const v = whole / scale;
  return negative ? -v : v;
}

export function parseReading(text: string, decimal: "." | ","): { value: number; suffix?: "C" | "F" | "K" } {
  // fast path for the common cell, e.g. "4.25" or "-18.3"
  if (decimal === "." && PLAIN.test(text)) return { value: +text };
  let s = text.trim().replace(/\u00a0|\u202f/g, "");
  let suffix: "C" | "F" | "K" | undefined;
  const u = UNIT_SUFFIX.exec(s);
  if (u && u.index > 0) {
    suffix = u[1]!.slice(-1).toUpperCase() as "C" | "F" | "K";
    s = s.slice(0, u.index);
  }
  let value = Number.NaN;
  if (decimal === ".") {
    if (POINT.test(s)) value = Number(s);
    else if (POINT_THOUSANDS.test(s)) value = Number(s.replace(/,/g, ""));
  } else if (COMMA.test(s)) value = Number(s.replace(",", "."));
  else if (COMMA_THOUSANDS.test(s)) value = Number(s.replace(/\./g, "").replace(",", "."));
  return suffix ? { value, suffix } : { value };
}

/** Which decimal separator the sample cells use: "," when comma-decimals outnumber point-decimals. */
export function detectDecimal(cells: readonly string[]): "." | "," {
  let comma = 0, point = 0;
  for (const c of cells) {
    const s = c.trim().replace(UNIT_SUFFIX, "");
    if (/^[+-]?\d+,\d+$/.test(s) && !/^[+-]?\d{1,3},\d{3}$/.test(s)) comma++;
    else if (/^[+-]?\d*\.\d+$/.test(s)) point++;
  }
  return comma > point ? "," : ".";
}

export type TemperatureUnit = "C" | "F" | "K";

/** Unit written in a column header, e.g. "Temp (°F)", "Air [K]", "temp_degC"; undefined when none. */
export function unitFromHeader(header: string): TemperatureUnit | undefined {
  const h = header.toLowerCase();
  if (/°\s*f\b|\(f\)|\[f\]|degf\b|fahrenheit|_f$/.test(h)) return "F";
  if (/°\s*c\b|\(c\)|\[c\]|degc\b|celsius|_c$/.test(h)) return "C";
  if (/\(k\)|\[k\]|kelvin|_k$/.test(h)) return "K";
  return undefined;
}

/** Converts a reading to °C (exact definitions: °F = °C·9/5 + 32, K = °C + 273.15). */
export function toCelsius(value: number, unit: TemperatureUnit): number {
  if (unit === "F") return ((value - 32) * 5) / 9;
  if (unit === "K") return value - 273.15;
  return value;
}
