/** A continuous episode beyond a threshold. Times in epoch seconds. */
export interface Excursion {
  start_s: number;
  end_s: number;
  duration_s: number;
  /** most extreme value reached (highest for "above", lowest for "below"), °C */
  peak_C: number;
  /** area beyond the threshold, K·s (divide by 60 for degree-minutes) */
  area_Ks: number;
}

export interface ExposureSummary {
  cumulative_s: number;
  longest_s: number;
  excursions: Excursion[];
}

/**
 * Time a piecewise-linear series spends strictly above `threshold_C`, with each crossing placed by
 * linear interpolation inside its sampling interval. A value that only touches the threshold adds no
 * time. The area beyond the threshold is integrated exactly for the linear segments.
 * `direction: "below"` measures time strictly below the threshold instead (the series is mirrored).
 */
export function timeBeyond(
  t_s: Float64Array,
  value_C: Float64Array,
  threshold_C: number,
  direction: "above" | "below" = "above",
): ExposureSummary {
  const sign = direction === "above" ? 1 : -1;
  const excursions: Excursion[] = [];
  let current: Excursion | null = null;
  let cumulative_s = 0;
  const n = t_s.length;
  // d = signed distance beyond the threshold (positive = beyond).
  const dist = (i: number) => sign * (value_C[i]! - threshold_C);
  const close = (end_s: number) => {
    if (!current) return;
    current.end_s = end_s;
    current.duration_s = end_s - current.start_s;
    if (current.duration_s > 0) excursions.push(current);
    current = null;
  };
  const open = (start_s: number, peak_C: number) => {
    current = { start_s, end_s: start_s, duration_s: 0, peak_C, area_Ks: 0 };
  };
  if (n > 0 && dist(0) > 0) open(t_s[0]!, value_C[0]!);
  for (let i = 1; i < n; i++) {
    const t0 = t_s[i - 1]!, t1 = t_s[i]!;
    const d0 = dist(i - 1), d1 = dist(i);
    const dt = t1 - t0;
    if (d0 > 0 && d1 > 0) {
      cumulative_s += dt;
      current!.area_Ks += ((d0 + d1) / 2) * dt;
    } else if (d0 > 0 || d1 > 0) {
      // Exactly one crossing inside the interval, at fraction f of the way from t0.
      const f = d0 / (d0 - d1);
      const tc = t0 + f * dt;
      if (d0 > 0) {
        cumulative_s += tc - t0;
        current!.area_Ks += (d0 / 2) * (tc - t0);
        close(tc);
      } else {
        open(tc, threshold_C);
        cumulative_s += t1 - tc;
        current!.area_Ks += (d1 / 2) * (t1 - tc);
      }
    }
    if (d1 > 0) {
      const ex = current as Excursion | null;
      if (ex) ex.peak_C = sign > 0 ? Math.max(ex.peak_C, value_C[i]!) : Math.min(ex.peak_C, value_C[i]!);
    }
  }
  if (n > 0) close(t_s[n - 1]!);
  const longest_s = excursions.reduce((m, e) => Math.max(m, e.duration_s), 0);
  return { cumulative_s, longest_s, excursions };
}

/**
 * Time strictly above `threshold_C` from the first sample up to each sample, s: the running form of
 * timeBeyond's cumulative time, with the same linear interpolation of crossings (its last value equals
 * timeBeyond(...).cumulative_s). Used to draw "minutes above" beside a growth curve.
 */
export function cumulativeTimeAbove(t_s: Float64Array, value_C: Float64Array, threshold_C: number): Float64Array {
  const out = new Float64Array(t_s.length);
  let sum = 0;
  for (let i = 1; i < t_s.length; i++) {
    const d0 = value_C[i - 1]! - threshold_C, d1 = value_C[i]! - threshold_C, dt = t_s[i]! - t_s[i - 1]!;
    if (d0 > 0 && d1 > 0) sum += dt;
    else if (d0 > 0) sum += (d0 / (d0 - d1)) * dt;
    else if (d1 > 0) sum += dt - (d0 / (d0 - d1)) * dt;
    out[i] = sum;
  }
  return out;
}
