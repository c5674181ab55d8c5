/**
 * Display decimation that keeps extremes: which samples a chart draws so that no spike vanishes.
 *
 * The time axis is cut into `buckets` equal spans (about one or two pixels each); in every span and
 * for every channel the samples with the smallest and the largest value are kept, plus the first and
 * last sample. This is the min/max-per-pixel method (drawing both extremes of every column draws the
 * same ink as drawing every sample; see e.g. Jugel et al., "M4: a visualization-oriented time series
 * data aggregation", PVLDB 7(10), 2014). So the global minimum and maximum of every channel survive.
 *
 * Two additions for a records tool, where what matters is a value beyond a limit:
 * - for every threshold and channel, each maximal run of samples beyond the threshold (an excursion,
 *   however short) keeps its most extreme sample, so two excursions in one pixel column both stay;
 * - the first sample of every run of missing values (NaN) is kept, so a break in a line stays a break.
 *
 * All channels share the kept indices (one time axis), so a hover reads every line at one instant.
 * The full series stays in the exports; this is for drawing only.
 */

export interface DecimateThreshold {
  value_C: number;
  direction: "above" | "below";
  /** indices of the channels the threshold applies to; all channels when omitted */
  channels?: number[];
}

export interface DecimateOptions {
  /** number of equal time spans; a chart about 800 px wide needs 400–800 */
  buckets: number;
  thresholds?: DecimateThreshold[];
}

/**
 * Indices (ascending, unique) of the samples to draw. `t` must be ascending; channels are as long as `t`.
 * Non-finite values are never picked as extremes.
 */
export function decimateIndices(t: ArrayLike<number>, channels: ReadonlyArray<ArrayLike<number>>, options: DecimateOptions): number[] {
  const n = t.length;
  if (n === 0) return [];
  const buckets = Math.max(1, Math.floor(options.buckets));
  if (n <= 2 * buckets + 2) return Array.from({ length: n }, (_, i) => i);
  const keep = new Uint8Array(n);
  keep[0] = 1;
  keep[n - 1] = 1;
  const t0 = t[0]!, span = t[n - 1]! - t0;
  const bucketOf = (i: number) => (span > 0 ? Math.min(buckets - 1, Math.floor(((t[i]! - t0) / span) * buckets)) : 0);

  for (const v of channels) {
    let b = -1, lo = -1, hi = -1;
    let wasMissing = false;
    const flush = () => {
      if (lo >= 0) keep[lo] = 1;
      if (hi >= 0) keep[hi] = 1;
    };
    for (let i = 0; i < n; i++) {
      const bi = bucketOf(i);
      if (bi !== b) {
        flush();
        b = bi;
        lo = hi = -1;
      }
      const x = v[i]!;
      if (!Number.isFinite(x)) {
        if (!wasMissing) keep[i] = 1;
        wasMissing = true;
        continue;
      }
      if (wasMissing) keep[i] = 1; // first value after a break
      wasMissing = false;
      if (lo < 0 || x < v[lo]!) lo = i;
      if (hi < 0 || x > v[hi]!) hi = i;
    }
    flush();
  }

  for (const th of options.thresholds ?? []) {
    const sign = th.direction === "above" ? 1 : -1;
    const which = th.channels ?? channels.map((_, k) => k);
    for (const k of which) {
      const v = channels[k];
      if (!v) continue;
      let peak = -1;
      for (let i = 0; i < n; i++) {
        const x = v[i]!;
        if (Number.isFinite(x) && sign * (x - th.value_C) > 0) {
          if (peak < 0 || sign * (x - v[peak]!) > 0) peak = i;
        } else if (peak >= 0) {
          keep[peak] = 1;
          peak = -1;
        }
      }
      if (peak >= 0) keep[peak] = 1;
    }
  }

  const out: number[] = [];
  for (let i = 0; i < n; i++) if (keep[i]) out.push(i);
  return out;
}

/** The values of `a` at `indices`. */
export function pick(a: ArrayLike<number>, indices: readonly number[]): number[] {
  return indices.map((i) => a[i]!);
}
