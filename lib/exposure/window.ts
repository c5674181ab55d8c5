/** A span [start_s, end_s] of a channel. */
export type Span = readonly [number, number];

/** Value of a piecewise-linear series at time t (t inside the series' range). */
function valueAt(t_s: Float64Array, v: Float64Array, t: number): number {
  let lo = 0, hi = t_s.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (t_s[mid]! <= t) lo = mid;
    else hi = mid;
  }
  const t0 = t_s[lo]!, t1 = t_s[hi]!;
  if (t1 === t0) return v[lo]!;
  return v[lo]! + ((v[hi]! - v[lo]!) * (t - t0)) / (t1 - t0);
}

/**
 * The parts of a piecewise-linear series that lie outside the given spans, each cut exactly at the
 * span edges (interpolated). Used to measure only what rests on real readings.
 */
export function partsOutside(t_s: Float64Array, v: Float64Array, spans: readonly Span[]): Array<{ t_s: Float64Array; v: Float64Array }> {
  const n = t_s.length;
  if (n === 0) return [];
  const sorted = [...spans].sort((a, b) => a[0] - b[0]);
  const keep: Span[] = [];
  let from = t_s[0]!;
  for (const [a, b] of sorted) {
    if (a > from) keep.push([from, Math.min(a, t_s[n - 1]!)]);
    from = Math.max(from, b);
  }
  if (from < t_s[n - 1]!) keep.push([from, t_s[n - 1]!]);
  return keep.filter(([a, b]) => b > a).map(([a, b]) => clip(t_s, v, a, b));
}

/** The series between times a and b (a < b, inside the series' range), cut exactly at a and b by interpolation. */
export function clip(t_s: Float64Array, v: Float64Array, a: number, b: number): { t_s: Float64Array; v: Float64Array } {
  const t: number[] = [a];
  const x: number[] = [valueAt(t_s, v, a)];
  for (let i = 0; i < t_s.length; i++) {
    const ti = t_s[i]!;
    if (ti > a && ti < b) {
      t.push(ti);
      x.push(v[i]!);
    }
  }
  t.push(b);
  x.push(valueAt(t_s, v, b));
  return { t_s: Float64Array.from(t), v: Float64Array.from(x) };
}
