/** A parsed logger trace in engine units: epoch seconds (UTC) and °C. */
export interface TraceSeries {
  /** sample times, seconds since the Unix epoch (UTC), strictly increasing */
  t_s: Float64Array;
  /** air temperature at each sample, °C; NaN marks a missing value (a gap) */
  air_C: Float64Array;
  /** product-probe (or product-simulant) temperature, °C, when the file has one; NaN marks a gap */
  probe_C?: Float64Array;
}

/** A span of the trace with no valid reading, bridged linearly by the models. */
export interface Gap {
  start_s: number;
  end_s: number;
  duration_s: number;
}

/** Default: a pause longer than 3 median intervals is a gap (a user setting of the import). */
export const DEFAULT_GAP_MULTIPLE = 3;

/** Median spacing of the sample times, s (0 for fewer than two samples). */
export function medianInterval_s(t_s: Float64Array): number {
  if (t_s.length < 2) return 0;
  const d = new Float64Array(t_s.length - 1);
  for (let i = 1; i < t_s.length; i++) d[i - 1] = t_s[i]! - t_s[i - 1]!;
  // Selection, not a sort: O(n) on average (a million intervals in milliseconds rather than a tenth of a second).
  const m = d.length >> 1;
  const upper = selectKth(d, m);
  if (d.length % 2) return upper;
  // After selecting the m-th, every value below index m is ≤ it: the lower middle is their maximum.
  let lower = -Infinity;
  for (let i = 0; i < m; i++) if (d[i]! > lower) lower = d[i]!;
  return (lower + upper) / 2;
}

/**
 * The k-th smallest value (from 0), by Hoare's quickselect with a median-of-three pivot; rearranges `a`
 * so that a[k] holds it, smaller-or-equal values before and greater-or-equal after.
 */
export function selectKth(a: Float64Array, k: number): number {
  let lo = 0, hi = a.length - 1;
  while (hi > lo) {
    const mid = (lo + hi) >> 1;
    // median of three as the pivot value: sorted inputs (the usual case here) stay O(n)
    const x = a[lo]!, y = a[mid]!, z = a[hi]!;
    const pivot = x < y ? (y < z ? y : x < z ? z : x) : x < z ? x : y < z ? z : y;
    let i = lo, j = hi;
    while (i <= j) {
      while (a[i]! < pivot) i++;
      while (a[j]! > pivot) j--;
      if (i <= j) {
        const t = a[i]!;
        a[i] = a[j]!;
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return a[k]!;
  }
  return a[k]!;
}

/**
 * Spans without a valid reading of one channel: runs of missing values between two valid readings,
 * and pauses between consecutive valid readings longer than `gapMultiple` median intervals. Each gap
 * runs from the last valid sample before it to the first valid one after it.
 */
export function findGaps(series: TraceSeries, gapMultiple = DEFAULT_GAP_MULTIPLE, values: Float64Array = series.air_C): Gap[] {
  const { t_s } = series;
  const limit = gapMultiple * medianInterval_s(t_s);
  const gaps: Gap[] = [];
  let lastValid = -1;
  for (let i = 0; i < t_s.length; i++) {
    if (Number.isNaN(values[i]!)) continue;
    if (lastValid >= 0) {
      const start_s = t_s[lastValid]!;
      const end_s = t_s[i]!;
      if (i - lastValid > 1 || (limit > 0 && end_s - start_s > limit)) gaps.push({ start_s, end_s, duration_s: end_s - start_s });
    }
    lastValid = i;
  }
  return gaps;
}

/**
 * Fills NaN runs by linear interpolation in time between the neighbouring valid readings (the stated
 * bridging rule). Leading or trailing NaN cannot be bridged and are an error: the importer trims them.
 */
export function bridgeGaps(series: TraceSeries, values: Float64Array = series.air_C): Float64Array {
  const { t_s } = series;
  const out = Float64Array.from(values);
  let lastValid = -1;
  for (let i = 0; i < out.length; i++) {
    if (Number.isNaN(out[i]!)) continue;
    if (lastValid >= 0 && i - lastValid > 1) {
      const t0 = t_s[lastValid]!, v0 = out[lastValid]!, t1 = t_s[i]!, v1 = out[i]!;
      for (let j = lastValid + 1; j < i; j++) out[j] = v0 + ((v1 - v0) * (t_s[j]! - t0)) / (t1 - t0);
    }
    lastValid = i;
  }
  if (lastValid < 0 || Number.isNaN(out[0]!) || Number.isNaN(out[out.length - 1]!)) {
    throw new Error("the channel starts or ends without a valid reading, which cannot be bridged");
  }
  return out;
}
