import { decimateIndices, type DecimateThreshold } from "./decimate";

/**
 * What a chart is sent: the kept samples of every channel on one time axis (ms), values rounded to
 * 0.001 °C (far below a pixel). The server builds this so the browser never receives a full series;
 * the full series stays in the CSV export.
 */
export interface DisplaySeries {
  times_ms: number[];
  channels: Record<string, number[]>;
}

export interface DisplaySeriesInput {
  t_s: ArrayLike<number>;
  channels: Record<string, ArrayLike<number> | null | undefined>;
  /** rule thresholds by channel key: each excursion beyond one keeps its peak */
  thresholds?: Array<{ value_C: number; direction: "above" | "below"; channels: string[] }>;
  /** time spans across the plot; 500 suits a chart about 850 px wide (two kept samples per bucket and channel) */
  buckets?: number;
}

export const DISPLAY_BUCKETS = 500;

const round3 = (x: number) => (Number.isFinite(x) ? Math.round(x * 1000) / 1000 : Number.NaN);

export function displaySeries(input: DisplaySeriesInput): DisplaySeries {
  const keys = Object.keys(input.channels).filter((k) => input.channels[k]);
  const arrays = keys.map((k) => input.channels[k]!);
  const thresholds: DecimateThreshold[] = (input.thresholds ?? []).map((th) => ({
    value_C: th.value_C,
    direction: th.direction,
    channels: th.channels.map((c) => keys.indexOf(c)).filter((i) => i >= 0),
  }));
  const idx = decimateIndices(input.t_s, arrays, { buckets: input.buckets ?? DISPLAY_BUCKETS, thresholds });
  return {
    times_ms: idx.map((i) => Math.round(input.t_s[i]! * 1000)),
    channels: Object.fromEntries(keys.map((k, j) => [k, idx.map((i) => round3(arrays[j]![i]!))])),
  };
}
