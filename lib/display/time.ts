import { DateTime, IANAZone } from "luxon";

/**
 * The one way Corelag shows a time: "2026-06-16 05:00 CEST", "2026-06-16 03:00 UTC",
 * "2026-06-16 00:00 UTC−3" — local wall time in the display zone, then the zone named (its
 * abbreviation when it has a common one, else its offset from UTC). Stored values stay UTC; this is
 * for reading only (exports and JSON keep ISO 8601 UTC).
 */

export const UTC = "UTC";

/** A usable IANA zone name, or UTC. */
export function displayZoneOrUtc(zone: string | null | undefined): string {
  return zone && IANAZone.isValidZone(zone) ? zone : UTC;
}

type Instant = Date | number | string;

function toDateTime(t: Instant, zone: string): DateTime {
  const z = displayZoneOrUtc(zone);
  const dt = typeof t === "string" ? DateTime.fromISO(t, { setZone: false }) : DateTime.fromMillis(t instanceof Date ? t.getTime() : t);
  return dt.setZone(z);
}

/** The zone as written after a time: "UTC", "CEST", "BST", or "UTC+5:30" when the zone has no common abbreviation. */
export function zoneLabel(t: Instant, zone: string): string {
  const dt = toDateTime(t, zone);
  if (dt.zoneName === UTC || dt.zoneName === "Etc/UTC") return UTC;
  const abbr = dt.setLocale("en-GB").offsetNameShort ?? "";
  if (/^[A-Z]{2,5}$/.test(abbr) && abbr !== "GMT") return abbr;
  const off = dt.offset; // minutes
  if (off === 0) return UTC;
  const sign = off > 0 ? "+" : "-";
  const h = Math.floor(Math.abs(off) / 60), m = Math.abs(off) % 60;
  return `UTC${sign}${h}${m ? `:${String(m).padStart(2, "0")}` : ""}`;
}

/** "2026-06-16 05:00 CEST"; with seconds: "2026-06-16 05:00:30 CEST". */
export function formatTime(t: Instant, zone: string, options: { seconds?: boolean } = {}): string {
  const dt = toDateTime(t, zone);
  if (!dt.isValid) return "invalid time";
  return `${dt.toFormat(options.seconds ? "yyyy-MM-dd HH:mm:ss" : "yyyy-MM-dd HH:mm")} ${zoneLabel(t, zone)}`;
}

/** A span: "2026-06-16 03:00 – 15:00 UTC" on one day, else both ends in full. */
export function formatSpan(a: Instant, b: Instant, zone: string): string {
  const da = toDateTime(a, zone), db = toDateTime(b, zone);
  const la = zoneLabel(a, zone), lb = zoneLabel(b, zone);
  if (da.hasSame(db, "day") && la === lb) return `${da.toFormat("yyyy-MM-dd HH:mm")} – ${db.toFormat("HH:mm")} ${lb}`;
  return `${formatTime(a, zone)} – ${formatTime(b, zone)}`;
}

/** Axis tick text in the display zone: the date at midnight, else the time of day. */
export function formatTick(ms: number, zone: string): string {
  const dt = toDateTime(ms, zone);
  return dt.hour === 0 && dt.minute === 0 ? dt.toFormat("dd LLL") : dt.toFormat("HH:mm");
}

/** Tick positions (ms) at round local times in the display zone, about `count` of them. */
export function timeTicks(start_ms: number, end_ms: number, zone: string, count = 6): number[] {
  if (!(end_ms > start_ms)) return [start_ms];
  const steps_min = [1, 2, 5, 10, 15, 30, 60, 120, 180, 360, 720, 1440, 2880, 7 * 1440, 14 * 1440, 30 * 1440];
  const want = (end_ms - start_ms) / 60000 / count;
  const step = steps_min.find((s) => s >= want) ?? steps_min[steps_min.length - 1]!;
  const z = displayZoneOrUtc(zone);
  let dt = DateTime.fromMillis(start_ms).setZone(z);
  // start at the first local time that is a multiple of the step (days counted from the local midnight)
  if (step >= 1440) dt = dt.startOf("day").plus({ days: dt.hour || dt.minute || dt.second || dt.millisecond ? 1 : 0 });
  else {
    const mins = dt.hour * 60 + dt.minute + (dt.second || dt.millisecond ? 1 : 0);
    const next = Math.ceil(mins / step) * step;
    dt = dt.startOf("day").plus({ minutes: next });
  }
  const out: number[] = [];
  const days = step / 1440;
  for (let guard = 0; dt.toMillis() <= end_ms && guard < 500; guard++) {
    out.push(dt.toMillis());
    dt = step >= 1440 ? dt.plus({ days }) : dt.plus({ minutes: step });
  }
  return out;
}
