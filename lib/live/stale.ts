import { medianInterval_s } from "../trace/series";

/**
 * A monitor is stale when no delivery has come for this many of its usual intervals: the same multiple that
 * makes a pause a gap in an import (lib/trace/series.ts, DEFAULT_GAP_MULTIPLE), so a monitor goes stale
 * exactly when its data would have a gap.
 */
export const STALE_MULTIPLE = 3;

/**
 * The shortest usual interval staleness is judged on, s: a silence of a few minutes is network jitter or a
 * gateway's retry, not a stopped logger (and the server's sweep only looks every 5 s).
 */
export const STALE_FLOOR_S = 60;

export interface Staleness {
  stale: boolean;
  /** seconds since the last delivery at `now_s` */
  silent_s: number;
  /** the usual interval the silence is judged against, s (null while it cannot be told) */
  interval_s: number | null;
  /** when the monitor goes (or went) stale, epoch s; null when it cannot be told yet */
  stale_at_s: number | null;
}

export interface StalenessOptions {
  /**
   * The readings' own times (device clock), epoch s, in order. Their median interval is a floor under the
   * delivery interval: a logger cannot be expected to deliver more often than it measures, so a replay that
   * delivers a 2-minute logger's readings every 0.2 s is not stale 0.6 s after it ends.
   */
  reading_t_s?: ArrayLike<number>;
  multiple?: number;
  floor_s?: number;
}

/**
 * Whether a monitor whose deliveries arrived at `arrivals_s` (the server's clock) is stale at `now_s` (the
 * same clock; passed in, never read here). The silence since the last delivery is compared with the usual
 * interval between deliveries, floored by the readings' own interval and by `STALE_FLOOR_S`.
 */
export function staleness(arrivals_s: readonly number[], now_s: number, options: StalenessOptions = {}): Staleness {
  const { multiple = STALE_MULTIPLE, floor_s = STALE_FLOOR_S, reading_t_s } = options;
  const n = arrivals_s.length;
  if (n === 0) return { stale: false, silent_s: 0, interval_s: null, stale_at_s: null };
  const last = arrivals_s[n - 1]!;
  const delivery = n >= 2 ? medianInterval_s(Float64Array.from(arrivals_s)) : null;
  const reading = reading_t_s && reading_t_s.length >= 2 ? medianInterval_s(Float64Array.from(reading_t_s)) : null;
  // nothing to go on until there are two deliveries or two readings; the fixed floor alone is no usual interval
  const interval = delivery === null && reading === null ? null : Math.max(delivery ?? 0, reading ?? 0, floor_s);
  const stale_at_s = interval !== null ? last + multiple * interval : null;
  return { stale: stale_at_s !== null && now_s > stale_at_s, silent_s: Math.max(0, now_s - last), interval_s: interval, stale_at_s };
}
