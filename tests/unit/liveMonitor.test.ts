import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { LiveMonitor, forecast, staleness, STALE_FLOOR_S, alertConditions, alertChanges, forecastDeadbandMin, type LiveReading } from "@/lib/live";
import { runReview } from "@/lib/review/runReview";
import { predict } from "@/lib/thermal/predict";
import { makeStepper, substepsFor } from "@/lib/thermal/stepper";
import { runChain } from "@/lib/thermal/solvers/chain";
import { buildNetwork } from "@/lib/thermal/network";
import { resolveProduct } from "@/lib/thermal/resolve";
import { resistances } from "@/lib/thermal/resistances";
import type { Pack, Product } from "@/lib/thermal/definitions";
import type { LimitSet } from "@/lib/exposure/limits";
import { expectClose } from "../helpers/numeric";

// A lumped product (no shape: Bi cannot be checked, so predict takes the exact lumped update) in a foam box
// without coolant. tau = R·C is worked from the definitions by the screening; the tests read it from there.
const tray: Product = { name: "tray", mass_kg: 0.45, properties: { cp_J_kgK: 3600 }, area_m2: 0.062, initial_C: 3.2 };
const box: Pack = { name: "box", h_outside_W_m2K: 8, area_m2: 0.1, layers: [{ name: "foam", thickness_m: 0.01, k_W_mK: 0.035 }], coolants: [] };
const limits: LimitSet = {
  name: "chilled",
  rules: [
    { id: "core-5", channel: "core", above_C: 5, max_cumulative_min: 120 },
    { id: "air-8", channel: "air", above_C: 8, max_continuous_min: 30 },
  ],
};

/** Invented logger-like readings: 5-min steps with jitter, a slow warm drift and a door opening. */
function readings(n: number, seed = 1): LiveReading[] {
  let s = seed;
  const rand = () => ((s = (s * 16807) % 2147483647) / 2147483647);
  const out: LiveReading[] = [];
  let t = 1_780_000_000;
  for (let i = 0; i < n; i++) {
    t += 240 + Math.round(rand() * 120);
    const air = 3 + i * 0.05 + (i % 17 === 5 ? 6 : 0) + rand() * 0.5;
    out.push({ t_s: t, air_C: Number(air.toFixed(2)) });
  }
  return out;
}

function batch(rs: readonly LiveReading[], product = tray, pack: Pack | undefined = box) {
  const sorted = [...rs].sort((a, b) => a.t_s - b.t_s);
  const series = { t_s: Float64Array.from(sorted, (r) => r.t_s), air_C: Float64Array.from(sorted, (r) => r.air_C) };
  return runReview({ series, product, pack, limits, options: { model: "auto" } });
}

describe("LiveMonitor (exact lumped update)", () => {
  it("after every reading, the core equals a batch review of the same readings to 1e-9 K, and the rules' status and minutes agree", () => {
    const rs = readings(60);
    const m = new LiveMonitor({ product: tray, pack: box, limits, model: "auto" });
    for (let i = 0; i < rs.length; i++) {
      m.add([rs[i]!]);
      if (i === 0) continue; // a review needs two readings
      const b = batch(rs.slice(0, i + 1));
      expect(m.model!.path).toBe("exact");
      for (let k = 0; k <= i; k++) expectClose(m.core_C[k]!, b.core_C[k]!, { abs: 1e-9 });
      const running = m.rules();
      b.result.rules.forEach((r, j) => {
        expect(running[j]!.status_so_far).toBe(r.status);
        expect(running[j]!.cumulative_min).toBe(r.cumulative_min);
      });
      expect(m.lastRestepped).toBe(1); // one new reading, one interval stepped: the history is not re-run
    }
  });

  it("late and out-of-order readings within the hour re-step from the first affected one and still equal the batch review (property)", () => {
    const all = readings(40, 7);
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 1, max: 4 }), { minLength: 1, maxLength: 30 }), fc.array(fc.integer({ min: 0, max: 6 }), { minLength: 40, maxLength: 40 }), (sizes, delays) => {
        // each reading is delivered up to 6 positions late (about 30 min: inside the hour), in batches of 1–4
        const order = all.map((r, i) => ({ r, at: i + delays[i]! })).sort((a, b) => a.at - b.at).map((x) => x.r);
        const m = new LiveMonitor({ product: tray, pack: box, limits, model: "auto" });
        let pos = 0, b = 0;
        while (pos < order.length) {
          const size = sizes[b++ % sizes.length]!;
          m.add(order.slice(pos, pos + size));
          pos += size;
          if (m.length < 2) continue;
          const ref = batch(all.filter((r) => m.t_s.includes(r.t_s)));
          for (let k = 0; k < m.length; k++) expectClose(m.core_C[k]!, ref.core_C[k]!, { abs: 1e-9 });
          m.rules().forEach((r, j) => expect(r.status_so_far).toBe(ref.result.rules[j]!.status));
        }
        expect(m.length).toBe(all.length);
      }),
      { numRuns: 25, seed: 17 },
    );
  });

  it("a repeated reading is ignored when equal and reported when different; one older than the hour is refused", () => {
    const rs = readings(20);
    const m = new LiveMonitor({ product: tray, pack: box, limits, model: "auto" });
    m.add(rs);
    const before = [...m.core_C];
    const out = m.add([rs[3]!, { ...rs[4]!, air_C: rs[4]!.air_C + 1 }, { t_s: rs[19]!.t_s - 3700, air_C: 4 }]);
    expect(out.map((o) => o.status)).toEqual(["duplicate", "conflict", "too-late"]);
    expect(m.core_C).toEqual(before);
  });

  it("remaining_min is the cumulative allowance left", () => {
    const m = new LiveMonitor({ product: tray, pack: box, limits, model: "auto" });
    m.add(readings(80));
    const core = m.rules().find((r) => r.id === "core-5")!;
    expect(core.remaining_min).toBeCloseTo(Math.max(0, 120 - core.cumulative_min), 2);
    expect(m.rules().find((r) => r.id === "air-8")!.remaining_min).toBeUndefined();
  });
});

describe("LiveMonitor (network continued from its state)", () => {
  // 1-D conduction of a sphere (Bi ≥ 0.1 makes the automatic choice conduction, on the chain solver)
  const sphere: Product = { name: "sphere", shape: { kind: "sphere", radius_m: 0.04 }, properties: { density_kg_m3: 1000, cp_J_kgK: 3600, k_W_mK: 0.5 }, initial_C: 3, h_W_m2K: 15 };
  it("equals one chain run over the same readings with the same internal steps to 1e-9 K, and predict's halving result within its 0.01 K", () => {
    const rs = readings(50, 3);
    const m = new LiveMonitor({ product: sphere, limits, model: "auto" });
    for (const r of rs) m.add([r]);
    expect(m.model!.path).toBe("chain");
    const t = Float64Array.from(rs, (r) => r.t_s), air = Float64Array.from(rs, (r) => r.air_C);
    const p = resolveProduct(sphere, Math.min(...air, 3));
    const b = buildNetwork(p, undefined, resistances(sphere, p.geometry, p.area_m2, undefined, sphere.initial_C), "conduction", 40);
    const sub = Int32Array.from({ length: t.length - 1 }, (_, k) => substepsFor(t[k + 1]! - t[k]!, m.model!.step_s!, k + 1));
    const run = runChain(b.net, t, air, b.initial_C, 1, sub, b.initialE_J);
    const n = b.net.mass.length;
    for (let k = 0; k < t.length; k++) {
      const centre = run.T[k * n + n - 1]!, next = run.T[k * n + n - 2]!;
      expectClose(m.core_C[k]!, centre - (next - centre) / 8, { abs: 1e-9 }); // predict's centre extrapolation
    }
    const ref = predict(sphere, undefined, t, air, { model: "auto" });
    for (let k = 0; k < t.length; k++) expectClose(m.core_C[k]!, ref.core[k]!, { abs: 0.01 });
  });

  it("late and out-of-order readings re-step the network from its checkpoint: the same bits as the readings in order (property)", () => {
    const all = readings(24, 11);
    const inOrder = new LiveMonitor({ product: sphere, limits, model: "auto" });
    for (const r of all) inOrder.add([r]);
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 5 }), { minLength: 24, maxLength: 24 }), (delays) => {
        const order = all.map((r, i) => ({ r, at: i + delays[i]! })).sort((a, b) => a.at - b.at).map((x) => x.r);
        const m = new LiveMonitor({ product: sphere, limits, model: "auto" });
        for (const r of order) m.add([r]);
        expect(m.model!.path).toBe("chain");
        for (let k = 0; k < all.length; k++) expectClose(m.core_C[k]!, inOrder.core_C[k]!, { abs: 1e-9 });
      }),
      { numRuns: 8, seed: 5 },
    );
  });
});

describe("forecast", () => {
  it("lumped body under a constant air step: the closed form t = tau·ln((T0 − Ta)/(T_limit − Ta))", () => {
    // Readings at 2 °C for an hour, then the air holds at 12 °C. Check value worked by hand from the
    // first-order step response (Incropera et al., §5.2): the core after the last reading, then the crossing.
    const t0 = 1_780_000_000;
    const rs: LiveReading[] = Array.from({ length: 13 }, (_, i) => ({ t_s: t0 + i * 300, air_C: 2 }));
    rs.push({ t_s: t0 + 13 * 300, air_C: 12 });
    const m = new LiveMonitor({ product: tray, pack: box, limits, model: "auto" });
    m.add(rs);
    const tau = m.model!.screening.tau_s;
    const T0 = m.core_C[m.length - 1]!;
    const f = forecast(m)!;
    expect(f.assumed_air_C).toBe(12);
    expect(f.limit_rule).toBe("core-5");
    expectClose(f.minutes_to_limit!, (tau * Math.log((T0 - 12) / (5 - 12))) / 60, { abs: 1e-9 });
    // and against an independent forward run of the exact update with the air held
    const tHit = t0 + 13 * 300 + f.minutes_to_limit! * 60;
    const pr = predict(tray, box, Float64Array.from([...rs.map((r) => r.t_s), tHit]), Float64Array.from([...rs.map((r) => r.air_C), 12]), { model: "auto" });
    expectClose(pr.core[pr.core.length - 1]!, 5, { abs: 1e-9 });
    expect(f.path[f.path.length - 1]!.value_C).toBeCloseTo(5, 9);
  });

  it("is null with a reason when the held air is below the limit", () => {
    const m = new LiveMonitor({ product: tray, pack: box, limits, model: "auto" });
    m.add(readings(5).map((r) => ({ ...r, air_C: 4 })));
    const f = forecast(m)!;
    expect(f.minutes_to_limit).toBeNull();
    expect(f.reason).toMatch(/never gets above 5 °C/);
  });

  it("holds the mean of the last K readings when asked", () => {
    const m = new LiveMonitor({ product: tray, pack: box, limits, model: "auto" });
    const rs = readings(10);
    m.add(rs);
    const f = forecast(m, { kind: "mean", last: 4 })!;
    expectClose(f.assumed_air_C, rs.slice(6).reduce((s, r) => s + r.air_C, 0) / 4, { abs: 1e-12 });
  });

  it("beyond the horizon of 3·tau gives no time and says why", () => {
    // air at 5.01 °C: the crossing of 5 °C from 3.2 °C takes tau·ln(1.81/0.01) ≈ 5.2·tau, past 3·tau
    const m = new LiveMonitor({ product: tray, pack: box, limits, model: "auto" });
    m.add([{ t_s: 1e9, air_C: 3.2 }, { t_s: 1e9 + 60, air_C: 5.01 }]);
    const f = forecast(m)!;
    expect(f.minutes_to_limit).toBeNull();
    expect(f.limit_rule).toBe("core-5");
    expect(f.reason).toMatch(/beyond the horizon of 3·tau/);
  });

  it("a pack with a coolant (network): the marched crossing agrees with a forward run of predict", () => {
    const gelPack: Pack = { ...box, h_inside_W_m2K: 5, coolants: [{ name: "gel", mass_kg: 0.1, melt_C: 0, latent_J_kg: 330_000, cp_solid_J_kgK: 2000, cp_liquid_J_kgK: 3800, initial_C: 1, area_m2: 0.02 }] };
    const t0 = 1_780_000_000;
    const rs: LiveReading[] = Array.from({ length: 7 }, (_, i) => ({ t_s: t0 + i * 300, air_C: i < 6 ? 3 : 25 }));
    const m = new LiveMonitor({ product: tray, pack: gelPack, limits, model: "auto" });
    m.add(rs);
    expect(m.model!.path).toBe("graph");
    const f = forecast(m)!;
    expect(f.minutes_to_limit).not.toBeNull();
    // forward run: the same readings, then the air held at 25 °C, sampled every 30 s; the crossing by interpolation
    const extra = Array.from({ length: Math.ceil((f.horizon_min * 60) / 30) }, (_, i) => t0 + 6 * 300 + (i + 1) * 30);
    const t = Float64Array.from([...rs.map((r) => r.t_s), ...extra]);
    const air = Float64Array.from(t, (_, i) => (i < 6 ? 3 : 25));
    const pr = predict(tray, gelPack, t, air, { model: "auto" });
    const k = pr.core.findIndex((v) => v > 5);
    const tCross = t[k - 1]! + ((5 - pr.core[k - 1]!) / (pr.core[k]! - pr.core[k - 1]!)) * (t[k]! - t[k - 1]!);
    // the live march and predict's halving each carry up to about 0.01 K; at the crossing's slope that is well under a minute
    expectClose(f.minutes_to_limit!, (tCross - (t0 + 6 * 300)) / 60, { abs: 1 });
  });
});

describe("staleness (injected clock)", () => {
  it("goes stale after 3 usual intervals without a reading, not before", () => {
    const t = [0, 300, 600, 900, 1200];
    expect(staleness(t, 1200 + 900).stale).toBe(false);
    expect(staleness(t, 1200 + 901).stale).toBe(true);
    expect(staleness(t, 1200 + 901).stale_at_s).toBe(2100);
    expect(staleness([5], 1e9).stale).toBe(false); // one reading: no usual interval yet
  });

  it("a replay that delivers a 2-minute logger's readings every 0.2 s is judged on the readings' 2 minutes, not stale as it ends", () => {
    // invented fixture: 361 readings 120 s apart (the demo trace's interval), delivered one per 0.2 s (--speed 600)
    const readings = Array.from({ length: 361 }, (_, i) => 1_781_575_200 + i * 120);
    const arrivals = Array.from({ length: 361 }, (_, i) => 1_000_000 + i * 0.2);
    const last = arrivals[360]!;
    const s = staleness(arrivals, last + 1, { reading_t_s: readings });
    expect(s.stale).toBe(false);
    expect(s.interval_s).toBe(120);
    // 3 × 120 s after the last delivery, on the server's clock
    expect(staleness(arrivals, last + 360, { reading_t_s: readings }).stale).toBe(false);
    expect(staleness(arrivals, last + 361, { reading_t_s: readings }).stale).toBe(true);
    expect(staleness(arrivals, last + 361, { reading_t_s: readings }).stale_at_s).toBeCloseTo(last + 360, 9);
  });

  it("a gateway that uploads hourly batches of 2-minute readings is judged on the hour between deliveries", () => {
    const readings = Array.from({ length: 91 }, (_, i) => i * 120); // invented fixture: 3 h of 2-minute readings
    const arrivals = [3600, 7200, 10_800];
    expect(staleness(arrivals, 10_800 + 3 * 3600, { reading_t_s: readings }).stale).toBe(false);
    expect(staleness(arrivals, 10_800 + 3 * 3600 + 1, { reading_t_s: readings })).toMatchObject({ stale: true, interval_s: 3600, silent_s: 3 * 3600 + 1 });
  });

  it("never judges on less than STALE_FLOOR_S: a 1-second logger is not stale after 4 s of silence", () => {
    const t = [0, 1, 2, 3, 4];
    expect(staleness(t, 4 + 3 * STALE_FLOOR_S, { reading_t_s: t }).stale).toBe(false);
    expect(staleness(t, 4 + 3 * STALE_FLOOR_S + 1, { reading_t_s: t }).stale).toBe(true);
    // one delivery carrying many readings: the readings' interval is all there is to judge by
    expect(staleness([50], 50 + 3 * 300 + 1, { reading_t_s: [0, 300, 600] }).stale).toBe(true);
  });
});

describe("alert conditions", () => {
  it("raises once per condition and clears when it ends", () => {
    const stale = { stale: true, silent_s: 1800, interval_s: 300, stale_at_s: 0 };
    const conds = alertConditions([{ id: "core-5", channel: "core", status_so_far: "fail", cumulative_min: 130, remaining_min: 0, reason: "x" }], null, stale, 60);
    expect(conds.map((c) => c.key)).toEqual(["rule-fail:core-5", "stale"]);
    expect(alertChanges(conds, ["stale"])).toEqual({ raise: [conds[0]], clear: [] });
    expect(alertChanges([], ["stale"]).clear).toEqual(["stale"]);
  });

  it("a forecast alert, once open, holds until the forecast moves beyond the lead plus its deadband (a fifth of the lead, at least 5 min), or says never", () => {
    const stale = { stale: false, silent_s: 0, interval_s: 300, stale_at_s: null };
    const fc = (minutes: number | null) => ({ assumed_air_C: 12, minutes_to_limit: minutes, limit_rule: "core-5", horizon_min: 600, reason: "held air 12 °C", path: [] });
    const keys = (minutes: number | null, open: string[]) => alertConditions([], fc(minutes), stale, 60, open).map((c) => c.key);
    expect(forecastDeadbandMin(60)).toBe(12);
    expect(forecastDeadbandMin(10)).toBe(5);
    // not open: raised at the lead (60 min), not beyond it
    expect(keys(60, [])).toEqual(["forecast:core-5"]);
    expect(keys(61, [])).toEqual([]);
    // open: still holds at 61 and 72 min (60 + 12), ends at 72.5 min and on "never"
    expect(keys(61, ["forecast:core-5"])).toEqual(["forecast:core-5"]);
    expect(keys(72, ["forecast:core-5"])).toEqual(["forecast:core-5"]);
    expect(keys(72.5, ["forecast:core-5"])).toEqual([]);
    expect(keys(null, ["forecast:core-5"])).toEqual([]);
    // a forecast wobbling 58, 63, 59, 66 min about a 60 min lead raises once and never clears in between
    let open: string[] = [];
    let raises = 0, clears = 0;
    for (const m of [58, 63, 59, 66, 61, 70]) {
      const ch = alertChanges(alertConditions([], fc(m), stale, 60, open), open);
      raises += ch.raise.length;
      clears += ch.clear.length;
      open = [...open.filter((k) => !ch.clear.includes(k)), ...ch.raise.map((c) => c.key)];
    }
    expect([raises, clears]).toEqual([1, 0]);
  });
});

describe("makeStepper", () => {
  it("chooses the same model as predict for the same range", () => {
    const s = makeStepper(tray, box, "auto", { lo_C: 3, hi_C: 10 }, tray.initial_C, 3);
    expect(s.path).toBe("exact");
    expect(s.screening.tau_s).toBe(predict(tray, box, Float64Array.of(0, 60), Float64Array.of(3, 10), { model: "auto" }).screening.tau_s);
  });
});
