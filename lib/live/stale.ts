import { medianInterval_s } from "../trace/series";

/**
 * A monitor is stale when no reading has come for this many of its usual (median) intervals: the same
 * multiple that makes a pause a gap in an import (lib/trace/series.ts, DEFAULT_GAP_MULTIPLE), so a monitor
 * goes stale exactly when its data would have a gap.
 */
export const STALE_MULTIPLE = 3;

export interface Staleness {
  stale: boolean;
  /** seconds since the last reading at `now_s` */
  silent_s: number;
  /** the usual interval, s (null with fewer than two readings) */
  interval_s: number | null;
  /** when the monitor goes (or went) stale, epoch s; null when it cannot be told yet */
  stale_at_s: number | null;
}

/** Whether a monitor with these reading times is stale at `now_s` (the clock is passed in, never read here). */
export function staleness(t_s: readonly number[], now_s: number, multiple = STALE_MULTIPLE): Staleness {
  const n = t_s.length;
  if (n === 0) return { stale: false, silent_s: 0, interval_s: null, stale_at_s: null };
  const last = t_s[n - 1]!;
  const interval = n >= 2 ? medianInterval_s(Float64Array.from(t_s)) : null;
  const stale_at_s = interval !== null && interval > 0 ? last + multiple * interval : null;
  return { stale: stale_at_s !== null && now_s > stale_at_s, silent_s: Math.max(0, now_s - last), interval_s: interval, stale_at_s };
}
