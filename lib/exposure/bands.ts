/**
 * Time a piecewise-linear series spends in each temperature band, s. Bands are [−∞, e0), [e0, e1), …,
 * [e_last, ∞). Within each sampling interval the value moves linearly, so the time in a band is the
 * interval's length times the share of the value's sweep that lies in the band (exact for the
 * linear interpolation). The bands' times add up to the series' duration.
 */
export function timeInBands(t_s: Float64Array, v: Float64Array, edges_C: readonly number[]): number[] {
  const lo = [-Infinity, ...edges_C];
  const hi = [...edges_C, Infinity];
  const out = new Array<number>(lo.length).fill(0);
  for (let i = 1; i < t_s.length; i++) {
    const dt = t_s[i]! - t_s[i - 1]!;
    const a = v[i - 1]!, b = v[i]!;
    if (a === b) {
      const k = hi.findIndex((h) => a < h);
      out[k] = out[k]! + dt;
      continue;
    }
    const min = Math.min(a, b), max = Math.max(a, b);
    for (let k = 0; k < lo.length; k++) {
      const overlap = Math.min(max, hi[k]!) - Math.max(min, lo[k]!);
      if (overlap > 0) out[k] = out[k]! + (dt * overlap) / (max - min);
    }
  }
  return out;
}

/** Band edges used in reports unless a caller gives its own, °C: the usual frozen and chilled limits. */
export const DEFAULT_BAND_EDGES_C: readonly number[] = [-18, -12, 0, 2, 5, 8, 10, 15, 25];

export function bandLabel(edges: readonly number[], k: number): string {
  if (k === 0) return `below ${edges[0]} °C`;
  if (k === edges.length) return `${edges[edges.length - 1]} °C and above`;
  return `${edges[k - 1]} to ${edges[k]} °C`;
}
