import { IANAZone } from "luxon";

/** A calendar date and clock time as written, before any zone is applied. */
export interface WallClock {
  y: number;
  mo: number;
  d: number;
  h: number;
  mi: number;
  s: number;
  ms: number;
  /** explicit UTC offset in minutes when the text carries one (Z = 0) */
  offsetMin?: number;
}

export type DateOrder = "ymd" | "dmy" | "mdy";

const ISO = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?)?\s*(Z|[+-]\d{2}(?::?\d{2})?)?$/;
const YMD_SLASH = /^(\d{4})[/.](\d{1,2})[/.](\d{1,2})(?:[ T,]+(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?\s*([AaPp][Mm])?)?$/;
const DMY_OR_MDY = /^(\d{1,2})[/.-](\d{1,2})[/.-](\d{4})(?:[ T,]+(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?\s*([AaPp][Mm])?)?$/;
const TIME_ONLY = /^(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?\s*([AaPp][Mm])?$/;

const MONTH_DAYS = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];
/** Days in month m (1–12) of year y, Gregorian leap years. */
const daysIn = (y: number, m: number) => (m === 2 && ((y % 4 === 0 && y % 100 !== 0) || y % 400 === 0) ? 29 : MONTH_DAYS[m - 1]!);
const frac = (s: string | undefined) => (s ? Math.round(Number(`0.${s}`) * 1000) : 0);

function hour12(h: number, ampm: string | undefined): number {
  if (!ampm) return h;
  if (h < 1 || h > 12) return Number.NaN;
  const pm = ampm.toLowerCase() === "pm";
  return (h % 12) + (pm ? 12 : 0);
}

/** Years a logger record can plausibly carry; outside them the clock was most likely never set. */
export const YEAR_RANGE = { min: 1990, max: 2100 } as const;

function valid(w: WallClock): WallClock | null {
  if (w.offsetMin !== undefined && Math.abs(w.offsetMin) > 14 * 60) return null; // real offsets lie within ±14 h
  if (!(w.mo >= 1 && w.mo <= 12 && w.d >= 1 && w.d <= daysIn(w.y, w.mo))) return null;
  if (!(w.h >= 0 && w.h <= 23 && w.mi >= 0 && w.mi <= 59 && w.s >= 0 && w.s <= 59)) return null;
  return w;
}

function parseOffset(z: string): number {
  if (z === "Z") return 0;
  const sign = z[0] === "-" ? -1 : 1;
  const digits = z.slice(1).replace(":", "");
  return sign * (Number(digits.slice(0, 2)) * 60 + Number(digits.slice(2, 4) || "0"));
}

/** The first and second numbers of a d/m or m/d date, for working out the order. */
export function slashDateParts(text: string): [number, number] | null {
  const m = DMY_OR_MDY.exec(text.trim());
  return m ? [Number(m[1]), Number(m[2])] : null;
}

const d2 = (s: string, i: number) => (s.charCodeAt(i) - 48) * 10 + (s.charCodeAt(i + 1) - 48);
const isDigit = (s: string, i: number) => {
  const c = s.charCodeAt(i);
  return c >= 48 && c <= 57;
};

const ISO_DIGITS = [0, 1, 2, 3, 5, 6, 8, 9, 11, 12, 14, 15, 17, 18] as const;

/** Fast path for the most common logger layout, "YYYY-MM-DDTHH:MM:SS" with optional ".fff" and "Z" (or space for T). */
function fastIso(s: string): WallClock | null {
  const n = s.length;
  if (n < 19 || s[4] !== "-" || s[7] !== "-" || (s[10] !== "T" && s[10] !== " ") || s[13] !== ":" || s[16] !== ":") return null;
  for (const i of ISO_DIGITS) if (!isDigit(s, i)) return null;
  let ms = 0;
  let i = 19;
  if (s[i] === ".") {
    let j = i + 1;
    while (j < n && isDigit(s, j)) j++;
    if (j === i + 1) return null;
    ms = Math.round(+s.slice(i, j) * 1000); // ".123" reads as 0.123
    i = j;
  }
  const utc = i === n - 1 && s[i] === "Z";
  if (i !== n && !utc) return null;
  const w: WallClock = { y: d2(s, 0) * 100 + d2(s, 2), mo: d2(s, 5), d: d2(s, 8), h: d2(s, 11), mi: d2(s, 14), s: d2(s, 17), ms };
  if (utc) w.offsetMin = 0;
  return valid(w);
}

/** Days from 1970-01-01 to a proleptic Gregorian date (H. Hinnant, "chrono-compatible low-level date algorithms", days_from_civil). */
function daysFromCivil(y: number, m: number, d: number): number {
  const yy = m <= 2 ? y - 1 : y;
  const era = Math.floor(yy / 400);
  const yoe = yy - era * 400;
  const doy = Math.floor((153 * (m > 2 ? m - 3 : m + 9) + 2) / 5) + d - 1;
  return era * 146097 + yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy - 719468;
}

/**
 * The import's per-row fast path: "YYYY-MM-DD[T ]HH:MM:SS[.fff][Z]" (the layout fastIso reads) straight to
 * wall-clock ms read as UTC, with no object and no substring; NaN for any other text, an invalid date or a
 * year outside YEAR_RANGE, so the caller falls back to parseWallClock and its messages. Equals
 * wallAsUtcMs(parseWallClock(s)) whenever it is a number (checked day by day in tests/unit/timestamps.test.ts).
 * Whether the text ends in "Z" is for the caller to see (its last character).
 */
export function isoWallMs(s: string): number {
  const n = s.length;
  if (n < 19 || s.charCodeAt(4) !== 45 || s.charCodeAt(7) !== 45 || s.charCodeAt(13) !== 58 || s.charCodeAt(16) !== 58) return Number.NaN;
  const sep = s.charCodeAt(10);
  if (sep !== 84 && sep !== 32) return Number.NaN;
  // unrolled: a loop over ISO_DIGITS ran at half this speed on a million rows
  const c0 = s.charCodeAt(0) - 48, c1 = s.charCodeAt(1) - 48, c2 = s.charCodeAt(2) - 48, c3 = s.charCodeAt(3) - 48;
  const c5 = s.charCodeAt(5) - 48, c6 = s.charCodeAt(6) - 48, c8 = s.charCodeAt(8) - 48, c9 = s.charCodeAt(9) - 48;
  const c11 = s.charCodeAt(11) - 48, c12 = s.charCodeAt(12) - 48, c14 = s.charCodeAt(14) - 48, c15 = s.charCodeAt(15) - 48;
  const c17 = s.charCodeAt(17) - 48, c18 = s.charCodeAt(18) - 48;
  // a character below '0' makes its value negative, so >>> 0 turns it huge: one test for all fourteen
  if ((c0 >>> 0) > 9 || (c1 >>> 0) > 9 || (c2 >>> 0) > 9 || (c3 >>> 0) > 9 || (c5 >>> 0) > 9 || (c6 >>> 0) > 9 || (c8 >>> 0) > 9) return Number.NaN;
  if ((c9 >>> 0) > 9 || (c11 >>> 0) > 9 || (c12 >>> 0) > 9 || (c14 >>> 0) > 9 || (c15 >>> 0) > 9 || (c17 >>> 0) > 9 || (c18 >>> 0) > 9) return Number.NaN;
  let ms = 0;
  let i = 19;
  if (i < n && s.charCodeAt(i) === 46) {
    let j = i + 1;
    while (j < n && isDigit(s, j)) j++;
    const digits = j - i - 1;
    if (digits === 0) return Number.NaN;
    if (digits <= 3) {
      // ".5", ".25", ".125": exact integers of ms, as Math.round(Number(".125") * 1000) gives
      for (let k = i + 1; k < j; k++) ms = ms * 10 + (s.charCodeAt(k) - 48);
      for (let k = digits; k < 3; k++) ms *= 10;
    } else ms = Math.round(+s.slice(i, j) * 1000);
    i = j;
  }
  if (i !== n && !(i === n - 1 && s.charCodeAt(i) === 90)) return Number.NaN;
  const y = c0 * 1000 + c1 * 100 + c2 * 10 + c3, mo = c5 * 10 + c6, d = c8 * 10 + c9;
  const h = c11 * 10 + c12, mi = c14 * 10 + c15, sec = c17 * 10 + c18;
  if (y < YEAR_RANGE.min || y > YEAR_RANGE.max || mo < 1 || mo > 12 || d < 1 || d > daysIn(y, mo) || h > 23 || mi > 59 || sec > 59) return Number.NaN;
  return daysFromCivil(y, mo, d) * 86_400_000 + h * 3_600_000 + mi * 60_000 + sec * 1000 + ms;
}

/** Reads a date-time in the given order (ISO and year-first dates are read whatever the order). Null when it is not one. */
export function parseWallClock(text: string, order: DateOrder): WallClock | null {
  const fast = fastIso(text);
  if (fast) return fast;
  const s = text.trim();
  let m = ISO.exec(s);
  if (m) {
    return valid({
      y: Number(m[1]), mo: Number(m[2]), d: Number(m[3]), h: Number(m[4] ?? 0), mi: Number(m[5] ?? 0), s: Number(m[6] ?? 0), ms: frac(m[7]),
      ...(m[8] ? { offsetMin: parseOffset(m[8]) } : {}),
    });
  }
  m = YMD_SLASH.exec(s);
  if (m) return valid({ y: Number(m[1]), mo: Number(m[2]), d: Number(m[3]), h: hour12(Number(m[4] ?? 0), m[8]), mi: Number(m[5] ?? 0), s: Number(m[6] ?? 0), ms: frac(m[7]) });
  m = DMY_OR_MDY.exec(s);
  if (m) {
    if (order === "ymd") return null;
    const [a, b] = [Number(m[1]), Number(m[2])];
    const [d, mo] = order === "dmy" ? [a, b] : [b, a];
    return valid({ y: Number(m[3]), mo, d, h: hour12(Number(m[4] ?? 0), m[8]), mi: Number(m[5] ?? 0), s: Number(m[6] ?? 0), ms: frac(m[7]) });
  }
  return null;
}

/** A clock time alone ("14:05", "2:05:30 PM"), as seconds after midnight; NaN when it is not one. */
export function parseTimeOfDay_s(text: string): number {
  const m = TIME_ONLY.exec(text.trim());
  if (!m) return Number.NaN;
  const h = hour12(Number(m[1]), m[5]), mi = Number(m[2]), s = Number(m[3] ?? 0);
  if (!(h >= 0 && h <= 23 && mi <= 59 && s <= 59)) return Number.NaN;
  return h * 3600 + mi * 60 + s + frac(m[4]) / 1000;
}

/** Wall clock read as if it were UTC, ms. */
export function wallAsUtcMs(w: WallClock): number {
  return Date.UTC(w.y, w.mo - 1, w.d, w.h, w.mi, w.s, w.ms);
}

/**
 * Places wall-clock times of one IANA zone on the time line, using luxon's zone data for the offsets.
 * At a daylight-saving change a wall time can have two instants (the repeated hour) or none (the
 * skipped hour). Repeated times are resolved by order: the earliest instant not before the previous
 * row's. Skipped times are read with the offset in force just before the change (as if the clock had
 * not been moved yet). Both are counted so the import can report them.
 */
export class ZoneResolver {
  /** null for "UTC": offset 0 at every instant, no zone data needed (luxon asking Intl costs ~10 ms at start-up) */
  private readonly zone: IANAZone | null;
  private readonly cache = new Map<number, { offs: number[]; skipped: boolean }>();
  ambiguous = 0;
  skipped = 0;

  constructor(zoneName: string) {
    if (zoneName === "UTC") {
      this.zone = null;
      return;
    }
    const z = IANAZone.create(zoneName);
    if (!z.isValid) throw new Error(`'${zoneName}' is not a known IANA time zone`);
    this.zone = z;
  }

  /**
   * UTC offsets (minutes) that put this wall time on the time line, earliest instant first; for a
   * skipped wall time, the offset in force before the change (the smaller one). Cached per 15-minute
   * slot of wall time, so a long trace asks the zone data once per slot.
   */
  private offsets(wallMs: number): { offs: number[]; skipped: boolean } {
    const slot = Math.floor(wallMs / 900_000);
    const hit = this.cache.get(slot);
    if (hit) return hit;
    const z = this.zone!; // not null: wallToEpochMs answers UTC before asking
    const cands = [...new Set([z.offset(wallMs - 86_400_000), z.offset(wallMs), z.offset(wallMs + 86_400_000)])];
    const ok = cands.filter((o) => z.offset(wallMs - o * 60_000) === o).sort((a, b) => b - a);
    const entry = ok.length > 0 ? { offs: ok, skipped: false } : { offs: [Math.min(...cands)], skipped: true };
    this.cache.set(slot, entry);
    return entry;
  }

  /** Epoch ms for a wall time, given the previous row's epoch ms (for ordering in the repeated hour). */
  toEpochMs(w: WallClock, previousMs: number): number {
    return this.wallToEpochMs(wallAsUtcMs(w), w.offsetMin, previousMs);
  }

  /** The same for a wall time already in ms (read as if UTC) and its explicit offset, if any. */
  wallToEpochMs(wall: number, offsetMin: number | undefined, previousMs: number): number {
    if (offsetMin !== undefined) return wall - offsetMin * 60_000;
    if (this.zone === null) return wall;
    const { offs, skipped } = this.offsets(wall);
    if (skipped) {
      this.skipped++;
      return wall - offs[0]! * 60_000;
    }
    if (offs.length === 1) return wall - offs[0]! * 60_000;
    this.ambiguous++;
    for (const o of offs) {
      const t = wall - o * 60_000;
      if (t >= previousMs) return t;
    }
    return wall - offs[offs.length - 1]! * 60_000;
  }
}
