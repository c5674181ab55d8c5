// Design profile from history (issue 15). Check values: identical traces must give back the trace itself at
// the 50th and 100th percentile (every column holds equal values); the 95th percentile of generated traces
// is compared with a reference computed here from numpy's documented default definition of percentile
// (method "linear": sort, h = (n − 1)·q/100, v[⌊h⌋] + (h − ⌊h⌋)(v[⌊h⌋+1] − v[⌊h⌋])), on grid values found
// by an independent linear interpolation (binary search). The same generated data was cross-checked once
// with numpy 2.4.6 `np.percentile(cols, 95, axis=0)` (`npm run bench` runs bench/history.ts, which prints the
// largest difference when python3 with numpy is present).
import { mkdtempSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { envelopeProfile, historyEnvelope, percentileLinear, smooth } from "@/lib/shipment";
import { profileSchema, profileSeries } from "@/lib/design/profile";
import { profileCommand } from "@/lib/cli/commands/profile";
import { generatedTrace } from "../helpers/historyTraces";

const generated = (j: number) => generatedTrace(j);

/** Reference interpolation: binary search for the bracketing samples. */
function refInterp(t: Float64Array, y: Float64Array, x: number): number {
  let lo = 0, hi = t.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (t[mid]! <= x) lo = mid;
    else hi = mid;
  }
  return y[lo]! + ((y[hi]! - y[lo]!) * (x - t[lo]!)) / (t[hi]! - t[lo]!);
}

function refPercentile(values: number[], q: number): number {
  const v = [...values].sort((a, b) => a - b);
  const h = ((v.length - 1) * q) / 100;
  const lo = Math.floor(h);
  return lo + 1 < v.length ? v[lo]! + (h - lo) * (v[lo + 1]! - v[lo]!) : v[lo]!;
}

describe("percentileLinear", () => {
  it("matches numpy's documented examples", () => {
    // numpy.percentile docs: a = [[10, 7, 4], [3, 2, 1]], np.percentile(a, 50) = 3.5
    expect(percentileLinear([10, 7, 4, 3, 2, 1], 50)).toBe(3.5);
    // worked by hand: [1, 2, 3, 4], q = 95: h = 2.85 → 3 + 0.85·1 = 3.85
    expect(percentileLinear([4, 1, 3, 2], 95)).toBeCloseTo(3.85, 12);
    expect(percentileLinear([4, 1, 3, 2], 100)).toBe(4);
    expect(percentileLinear([4, 1, 3, 2], 0)).toBe(1);
  });
});

describe("historyEnvelope", () => {
  it("identical traces give the trace itself at the 50th and 100th percentile", () => {
    const tr = generated(0);
    for (const q of [50, 100]) {
      const env = historyEnvelope([tr, tr, tr], { percentile: q, step_s: 60, align: "departure" });
      // the grid is the trace's own sampling (60 s from the first sample): the samples, bit for bit
      expect(env.offset_s.length).toBe(tr.t_s.length);
      expect(Array.from(env.profile_C)).toEqual(Array.from(tr.air_C));
      expect(Array.from(env.min_C)).toEqual(Array.from(tr.air_C));
    }
  });

  it("the 95th percentile of 7 generated traces matches numpy's linear percentile on the grid to 1e-9 K", () => {
    const traces = Array.from({ length: 7 }, (_, j) => generated(j));
    const step_s = 300;
    const env = historyEnvelope(traces, { percentile: 95, step_s, align: "departure" });
    // common span after aligning by the first sample: the shortest trace
    const span = Math.min(...traces.map((t) => t.t_s[t.t_s.length - 1]! - t.t_s[0]!));
    expect(env.offset_s.length).toBe(Math.floor(span / step_s) + 1);
    let worst = 0;
    env.offset_s.forEach((u, i) => {
      const col = traces.map((t) => refInterp(t.t_s, t.air_C, t.t_s[0]! + u));
      worst = Math.max(worst, Math.abs(env.percentile_C[i]! - refPercentile(col, 95)));
      expect(env.max_C[i]).toBe(Math.max(...col));
    });
    expect(worst).toBeLessThan(1e-9);
  });

  it("time-of-day alignment puts each trace on its clock time; a given departure moves the origin", () => {
    const a = generated(1), b = generated(2);
    const shifted = { t_s: a.t_s.map((t) => t + 86400), air_C: a.air_C }; // the same trace a day later
    const env = historyEnvelope([a, shifted], { percentile: 100, step_s: 600, align: "time-of-day" });
    // the same clock times on two days: every column holds two equal values
    expect(Array.from(env.min_C)).toEqual(Array.from(env.max_C));
    expect(env.offset_s[0]! % 600).toBe(0);
    const dep = historyEnvelope([{ ...b, departure_s: b.t_s[0]! - 1800 }], { percentile: 50, step_s: 600, align: "departure" });
    expect(dep.offset_s[0]).toBe(1800); // the grid starts where the trace has readings
  });

  it("refuses traces that do not overlap once aligned", () => {
    const a = generated(1);
    const later = { t_s: a.t_s.map((t) => t + 12 * 3600), air_C: a.air_C }; // 16:00–02:00 against 04:00–14:00
    expect(() => historyEnvelope([a, later], { percentile: 95, step_s: 600, align: "time-of-day" })).toThrow(/share less than one step/);
  });

  it("smoothing is a centred moving average, shrinking at the ends", () => {
    // worked by hand: [0, 3, 6, 0, 3] with width 3 → [0, 3, 3, 3, 3]
    expect(Array.from(smooth(Float64Array.from([0, 3, 6, 0, 3]), 3))).toEqual([0, 3, 3, 3, 3]);
  });

  it("the stored profile reproduces the grid values at the grid times", () => {
    const traces = Array.from({ length: 4 }, (_, j) => generated(j));
    const env = historyEnvelope(traces, { percentile: 95, step_s: 900, align: "departure" });
    const p = profileSchema.parse(envelopeProfile(env, 900, "test"));
    const s = profileSeries(p);
    expect(s.t_s.length).toBe(env.offset_s.length);
    s.air_C.forEach((v, i) => expect(Math.abs(v - env.profile_C[i]!)).toBeLessThan(1e-9));
  });
});

describe("corelag profile from-traces", () => {
  it("prints the stored profile format with percentile, step_min and sources", async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), "corelag-prof-"));
    const files = [0, 1, 2].map((j) => {
      const { t_s, air_C } = generated(j);
      const f = path.join(dir, `t${j}.csv`);
      writeFileSync(f, "Time,Air (°C)\n" + Array.from(t_s, (t, i) => `${new Date(t * 1000).toISOString().replace(".000Z", "Z")},${air_C[i]!.toFixed(2)}`).join("\n") + "\n");
      return f;
    });
    const p = (await profileCommand(["from-traces", ...files, "--percentile", "95", "--step-min", "15", "--format", "json"])) as Record<string, unknown> & { segments: Array<{ kind: string; duration_min: number }>; sources: Array<{ file: string; sha256: string }> };
    expect(p.percentile).toBe(95);
    expect(p.step_min).toBe(15);
    expect(p.sources.map((s) => s.file)).toEqual(["t0.csv", "t1.csv", "t2.csv"]);
    expect(p.sources[0]!.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(p.segments.every((s) => s.kind === "ramp" && s.duration_min === 15)).toBe(true);
    expect(typeof p.initial_C).toBe("number");
    expect(profileSchema.safeParse(p).success).toBe(true); // ready for size --profile
    await expect(profileCommand(["from-traces", ...files, "--percentile", "101", "--step-min", "15"])).rejects.toThrow(/--percentile: '101' must be between 0 and 100/);
  });
});
