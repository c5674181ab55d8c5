// A design profile learned from the stored air of real shipments: align the traces (time since departure,
// or time of day), resample each on one grid by exact linear interpolation between its samples, take a
// percentile across the traces at every grid step (numpy's default "linear" definition), optionally
// smooth it, and write it as a stored profile (initial value, then one ramp per grid step).
//
// A per-step percentile is not the temperature history of any real shipment: at every step it takes
// whichever trace is high at that moment, so the profile is more severe than most of the shipments.
import { DateTime } from "luxon";
import type { Profile } from "../design/profile";

export type Alignment = "departure" | "time-of-day";

export interface HistoryTrace {
  t_s: Float64Array;
  air_C: Float64Array;
  /** departure time, epoch s; default: the first sample */
  departure_s?: number;
}

export interface HistoryOptions {
  percentile: number;
  step_s: number;
  align: Alignment;
  /** IANA zone whose midnight starts a day, for align "time-of-day" (default UTC) */
  timeZone?: string;
  /** centred moving average over this many grid steps (odd, ≥ 1; 1 or none = no smoothing) */
  smooth_steps?: number;
}

export interface HistoryEnvelope {
  /** grid times as offsets, s: since departure, or since midnight of each trace's first day */
  offset_s: Float64Array;
  /** the percentile per step, before smoothing */
  percentile_C: Float64Array;
  /** the profile: the percentile, smoothed when asked */
  profile_C: Float64Array;
  min_C: Float64Array;
  max_C: Float64Array;
  /** each trace on the grid, °C */
  traces_C: Float64Array[];
  /** the epoch s where the grid starts for the first trace (to give the profile a start time) */
  start_s: number;
}

/**
 * The q-th percentile (0–100) of values as numpy.percentile computes it by default (method "linear",
 * Hyndman & Fan type 7): sort, h = (n − 1)·q/100, v[⌊h⌋] + (h − ⌊h⌋)·(v[⌊h⌋+1] − v[⌊h⌋]).
 */
export function percentileLinear(values: ArrayLike<number>, q: number): number {
  const n = values.length;
  if (n === 0) throw new RangeError("percentile of no values");
  if (!(q >= 0 && q <= 100)) throw new RangeError(`percentile ${q} is not between 0 and 100`);
  const v = Float64Array.from(values).sort();
  const h = ((n - 1) * q) / 100;
  const lo = Math.floor(h);
  if (lo >= n - 1) return v[n - 1]!;
  return v[lo]! + (h - lo) * (v[lo + 1]! - v[lo]!);
}

/**
 * Linear interpolation of (t, y) at each of the times `at` (ascending, inside [t0, tn]). Missing values
 * (NaN) are bridged linearly by the neighbouring readings, as a review bridges gaps.
 */
export function interpolateAt(t: Float64Array, y: Float64Array, at: Float64Array): Float64Array {
  const keepT: number[] = [], keepY: number[] = [];
  for (let i = 0; i < t.length; i++) if (!Number.isNaN(y[i]!)) { keepT.push(t[i]!); keepY.push(y[i]!); }
  if (keepT.length === 0) throw new RangeError("the trace has no readings");
  const out = new Float64Array(at.length);
  let k = 0;
  for (let i = 0; i < at.length; i++) {
    const x = at[i]!;
    if (x < keepT[0]! || x > keepT[keepT.length - 1]!) throw new RangeError(`time ${x} is outside the trace`);
    while (k + 1 < keepT.length && keepT[k + 1]! < x) k++;
    if (keepT[k] === x || k + 1 >= keepT.length) out[i] = keepY[k]!;
    else {
      const t0 = keepT[k]!, t1 = keepT[k + 1]!;
      out[i] = t1 === x ? keepY[k + 1]! : keepY[k]! + ((keepY[k + 1]! - keepY[k]!) * (x - t0)) / (t1 - t0);
    }
  }
  return out;
}

/** Centred moving average over `width` steps (odd); the window shrinks symmetrically at the ends. */
export function smooth(v: Float64Array, width: number): Float64Array {
  if (width <= 1) return Float64Array.from(v);
  const half = Math.floor(width / 2);
  const out = new Float64Array(v.length);
  for (let i = 0; i < v.length; i++) {
    const h = Math.min(half, i, v.length - 1 - i);
    let s = 0;
    for (let j = i - h; j <= i + h; j++) s += v[j]!;
    out[i] = s / (2 * h + 1);
  }
  return out;
}

/** The origin of each trace's offsets: its departure, or midnight of its first sample's day in the zone. */
function originOf(tr: HistoryTrace, align: Alignment, zone: string): number {
  if (align === "departure") return tr.departure_s ?? tr.t_s[0]!;
  const dt = DateTime.fromSeconds(tr.t_s[0]!, { zone });
  if (!dt.isValid) throw new RangeError(`time zone '${zone}' is not a known IANA zone`);
  return dt.startOf("day").toSeconds();
}

/**
 * The grid covers the offsets every trace has readings for (a step where some traces have no data would
 * take its percentile over fewer traces without saying so), on multiples of the step from the origin.
 */
export function historyEnvelope(traces: readonly HistoryTrace[], o: HistoryOptions): HistoryEnvelope {
  if (traces.length === 0) throw new RangeError("choose at least one trace");
  if (!(o.step_s > 0)) throw new RangeError("the step must be positive");
  const zone = o.timeZone ?? "UTC";
  const origins = traces.map((tr) => originOf(tr, o.align, zone));
  let from = -Infinity, to = Infinity;
  traces.forEach((tr, i) => {
    from = Math.max(from, tr.t_s[0]! - origins[i]!);
    to = Math.min(to, tr.t_s[tr.t_s.length - 1]! - origins[i]!);
  });
  const k0 = Math.ceil(from / o.step_s - 1e-12), k1 = Math.floor(to / o.step_s + 1e-12);
  if (k1 - k0 < 1) throw new RangeError(`the traces share less than one step of ${o.step_s / 60} min once aligned by ${o.align}; choose traces that overlap, or a shorter step`);
  const n = k1 - k0 + 1;
  const offset_s = Float64Array.from({ length: n }, (_, i) => (k0 + i) * o.step_s);
  const traces_C = traces.map((tr, j) => {
    const at = offset_s.map((u) => u + origins[j]!);
    // a grid point a rounding error outside the trace is its end point
    at[0] = Math.max(at[0]!, tr.t_s[0]!);
    at[n - 1] = Math.min(at[n - 1]!, tr.t_s[tr.t_s.length - 1]!);
    return interpolateAt(tr.t_s, tr.air_C, at);
  });
  const percentile_C = new Float64Array(n), min_C = new Float64Array(n), max_C = new Float64Array(n);
  const column = new Float64Array(traces.length);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < traces.length; j++) column[j] = traces_C[j]![i]!;
    percentile_C[i] = percentileLinear(column, o.percentile);
    min_C[i] = Math.min(...column);
    max_C[i] = Math.max(...column);
  }
  const profile_C = smooth(percentile_C, o.smooth_steps ?? 1);
  return { offset_s, percentile_C, profile_C, min_C, max_C, traces_C, start_s: origins[0]! + offset_s[0]! };
}

/** Rounding of the stored profile's temperatures: 1e-9 K, far below any sensor, so the JSON stays short. */
const roundK = (x: number) => Math.round(x * 1e9) / 1e9;

/**
 * The envelope's profile as a stored profile: initial_C at the first grid step, then one ramp of the step
 * length to each next grid value; sampled every step (or a divisor of it ≤ 3600 s), so profileSeries
 * returns the grid values at the grid times.
 */
export function envelopeProfile(env: HistoryEnvelope, step_s: number, name: string): Profile {
  let interval_s = step_s;
  for (let d = Math.min(step_s, 3600); d >= 10; d--) if (step_s % d === 0) { interval_s = d; break; }
  return {
    name,
    start: new Date(Math.round(env.start_s) * 1000).toISOString(),
    interval_s,
    initial_C: roundK(env.profile_C[0]!),
    segments: Array.from(env.profile_C.subarray(1), (v) => ({ kind: "ramp" as const, to_C: roundK(v), duration_min: step_s / 60 })),
  };
}

export const HISTORY_PROFILE_CAUTION =
  "A per-time-step percentile is not the temperature history of any real shipment: at every step it takes whichever shipment was warm (or cold) at that moment, so it is more severe than most of the shipments it was built from.";
