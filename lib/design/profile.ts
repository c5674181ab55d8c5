import { z } from "zod";
import type { TraceSeries } from "../trace/series";
import { capped, quantity, strictObject } from "../quantity";

/** A segment lasts 0.1 min to 60 days. */
const minutes = quantity("duration_min", "min", 0.1, 60 * 24 * 60);
/** Design air temperatures: -60 to 80 °C. */
const celsius = (what: string) => quantity(what, "°C", -60, 80);

/** Caps: segments in one list, nesting of repeats, segments after expanding every repeat, samples. */
export const MAX_SEGMENTS = 200;
/** The top-level list may be longer: a profile learned from history has one ramp per grid step (5,000 = 3.5 days at 1 min). */
export const MAX_TOP_SEGMENTS = 5000;
export const MAX_DEPTH = 5;
export const MAX_EXPANDED_SEGMENTS = 100_000;
const MAX_SAMPLES = 2_000_000;

export type Segment =
  | { kind: "hold"; C: number; duration_min: number }
  | { kind: "ramp"; to_C: number; duration_min: number }
  | { kind: "repeat"; count: number; segments: Segment[] };

export const segmentSchema: z.ZodType<Segment> = z.lazy(() =>
  z.discriminatedUnion("kind", [
    strictObject({ kind: z.literal("hold"), C: celsius("C"), duration_min: minutes }),
    strictObject({ kind: z.literal("ramp"), to_C: celsius("to_C"), duration_min: minutes }),
    strictObject({
      kind: z.literal("repeat"),
      count: quantity("count", "", 1, 1000).int({ message: "count must be a whole number" }),
      segments: capped(segmentSchema, "segments", MAX_SEGMENTS, 1),
    }),
  ], { error: "segment kind must be hold, ramp or repeat" }),
);

/** One trace a history profile was built from. */
function historySourceSchema() {
  return strictObject({
    file: z.string().trim().min(1).max(300),
    sha256: z.string().regex(/^[0-9a-f]{64}$/, { message: "sha256 must be 64 lowercase hex digits" }),
    shipment: z.string().trim().min(1).max(120).optional(),
    trace_id: z.string().trim().min(1).max(60).optional(),
    position: z.string().trim().max(120).optional(),
  });
}

/**
 * A design ambient profile built from segments: hold at a temperature, ramp to one, or repeat a
 * block. Sampled every interval_s from start. A hold jumps to its temperature at its start.
 */
export const profileSchema = strictObject({
  name: z.string().trim().min(1, { message: "name is required" }).max(120),
  start: z.iso.datetime({ offset: true, message: "start must be an ISO 8601 date-time with Z or an offset" }).default("2026-07-01T00:00:00Z"),
  interval_s: quantity("interval_s", "s", 10, 3600).int({ message: "interval_s must be a whole number of seconds" }).default(60),
  initial_C: celsius("initial_C"),
  segments: capped(segmentSchema, "segments", MAX_TOP_SEGMENTS, 1),
  /** provenance of a profile learned from history (lib/shipment/historyProfile.ts): the percentile taken per step */
  percentile: quantity("percentile", "", 0, 100).optional(),
  /** the grid step of that profile, min */
  step_min: quantity("step_min", "min", 0.1, 1440).optional(),
  /** the traces it was built from: file name and SHA-256 of the original bytes, and where stored, the shipment and trace */
  sources: capped(historySourceSchema(), "sources", 1000, 1).optional(),
}).superRefine((p, ctx) => {
  const size = profileSize(p.segments);
  if (size.depth > MAX_DEPTH) ctx.addIssue({ code: "custom", path: ["segments"], message: `repeats may be nested at most ${MAX_DEPTH} deep` });
  else if (size.segments > MAX_EXPANDED_SEGMENTS) ctx.addIssue({ code: "custom", path: ["segments"], message: `the repeats expand to ${size.segments.toLocaleString("en")} segments; at most ${MAX_EXPANDED_SEGMENTS.toLocaleString("en")} are allowed` });
  else if (size.duration_s / p.interval_s > MAX_SAMPLES) ctx.addIssue({ code: "custom", path: ["segments"], message: `the profile lasts ${(size.duration_s / 86400).toFixed(1)} days, more than ${MAX_SAMPLES.toLocaleString("en")} samples at ${p.interval_s} s` });
});
export type Profile = z.infer<typeof profileSchema>;

/** Duration, expanded segment count and repeat depth, computed without expanding the repeats. */
export function profileSize(segs: Segment[]): { duration_s: number; segments: number; depth: number } {
  let duration_s = 0, segments = 0, depth = 0;
  for (const s of segs) {
    if (s.kind === "repeat") {
      const inner = profileSize(s.segments);
      duration_s += s.count * inner.duration_s;
      segments += s.count * inner.segments;
      depth = Math.max(depth, inner.depth + 1);
    } else {
      duration_s += s.duration_min * 60;
      segments += 1;
    }
  }
  return { duration_s, segments, depth };
}

/** The profile as a trace: piecewise-linear air temperature at the profile's sampling interval. */
export function profileSeries(p: Profile): TraceSeries {
  // Break points (time from start in s, temperature), then sampled.
  const pts: Array<[number, number]> = [[0, p.initial_C]];
  let t = 0;
  let cur = p.initial_C;
  const walk = (segs: Segment[]) => {
    for (const s of segs) {
      if (s.kind === "repeat") {
        for (let i = 0; i < s.count; i++) walk(s.segments);
      } else if (s.kind === "hold") {
        if (s.C !== cur) pts.push([t, s.C]); // a step: two points at one time
        cur = s.C;
        t += s.duration_min * 60;
        pts.push([t, cur]);
      } else {
        t += s.duration_min * 60;
        cur = s.to_C;
        pts.push([t, cur]);
      }
      if (t / p.interval_s > MAX_SAMPLES) throw new Error(`the profile is longer than ${MAX_SAMPLES.toLocaleString("en")} samples`);
    }
  };
  walk(p.segments);
  const start_s = Date.parse(p.start) / 1000;
  const n = Math.floor(t / p.interval_s) + 1;
  const t_s = new Float64Array(n);
  const air = new Float64Array(n);
  let k = 0;
  for (let i = 0; i < n; i++) {
    const ti = i * p.interval_s;
    // the last break point at or before ti, taking the later of two points at the same time (a step)
    while (k + 1 < pts.length && pts[k + 1]![0] <= ti) k++;
    const [t0, v0] = pts[k]!;
    const next = pts[k + 1];
    air[i] = next && next[0] > t0 ? v0 + ((next[1] - v0) * (ti - t0)) / (next[0] - t0) : v0;
    t_s[i] = start_s + ti;
  }
  return { t_s, air_C: air };
}

/** Example profiles of our own (not standards): a hot-weather and a cold-weather route for a chilled tote. */
export const EXAMPLE_PROFILES: readonly Profile[] = [
  {
    name: "Example: summer multi-drop route, 2 days",
    start: "2026-07-01T04:00:00Z",
    interval_s: 60,
    initial_C: 4,
    segments: [
      { kind: "repeat", count: 2, segments: [
        { kind: "hold", C: 4, duration_min: 120 },
        { kind: "ramp", to_C: 28, duration_min: 20 },
        { kind: "hold", C: 28, duration_min: 90 },
        { kind: "ramp", to_C: 6, duration_min: 30 },
        { kind: "repeat", count: 4, segments: [{ kind: "hold", C: 5, duration_min: 75 }, { kind: "hold", C: 18, duration_min: 10 }] },
        { kind: "hold", C: 4, duration_min: 540 },
      ] },
    ],
  },
  {
    name: "Example: winter route with a cold dock, 1 day",
    start: "2026-01-15T05:00:00Z",
    interval_s: 60,
    initial_C: 3,
    segments: [
      { kind: "hold", C: 3, duration_min: 90 },
      { kind: "ramp", to_C: -8, duration_min: 15 },
      { kind: "hold", C: -8, duration_min: 120 },
      { kind: "ramp", to_C: 3, duration_min: 30 },
      { kind: "repeat", count: 3, segments: [{ kind: "hold", C: 3, duration_min: 120 }, { kind: "hold", C: -2, duration_min: 15 }] },
      { kind: "hold", C: 3, duration_min: 720 },
    ],
  },
];
