// Design-study benchmarks: a sizing search on a 7-day, 1-minute profile, and 1,000 Monte Carlo
// samples of a 10,000-sample lumped review.
import { performance } from "node:perf_hooks";
import { size } from "../lib/design/sizing";
import { monteCarlo } from "../lib/uncertainty/monteCarlo";
import { profileSeries, profileSchema } from "../lib/design/profile";
import type { Pack, Product } from "../lib/thermal/definitions";

const product: Product = { name: "tray", mass_kg: 0.45, properties: { cp_J_kgK: 3600 }, area_m2: 0.062, initial_C: 3 };
const pack: Pack = { name: "tote", h_outside_W_m2K: 8, h_inside_W_m2K: 4, area_m2: 0.08, layers: [{ name: "EPS", thickness_m: 0.02, k_W_mK: 0.035 }], coolants: [] };
const limits = { name: "chilled", rules: [{ id: "core-above-8C", channel: "core" as const, above_C: 8 }] };

export function benchDesign(): void {
  const week = profileSeries(
    profileSchema.parse({
      name: "bench week",
      interval_s: 60,
      initial_C: 4,
      segments: [{ kind: "repeat", count: 7, segments: [{ kind: "hold", C: 4, duration_min: 600 }, { kind: "ramp", to_C: 14, duration_min: 60 }, { kind: "hold", C: 14, duration_min: 120 }, { kind: "ramp", to_C: 4, duration_min: 60 }, { kind: "hold", C: 4, duration_min: 600 }] }],
    }),
  );
  let t0 = performance.now();
  const r = size({ series: week, product, pack, limits, variable: { kind: "layer", index: 0, field: "thickness_m" }, min: 0.001, max: 0.2 });
  const sizingMs = performance.now() - t0;
  console.log(`sizing: ${week.t_s.length.toLocaleString("en")}-sample (7-day, 1-minute) profile, ${r.runs} model runs in ${sizingMs.toFixed(0)} ms (target < 2000); EPS thickness ${r.value === null ? "none feasible" : `${(r.value * 1000).toFixed(1)} mm`} to ±0.1 mm`);

  const t = Float64Array.from({ length: 10_000 }, (_, i) => i * 60);
  const series = { t_s: t, air_C: Float64Array.from(t, (ti) => 4 + 5.5 * Math.sin(ti / 20_000)) };
  // a threshold near the nominal core peak (about 7.6 °C here), so the failure fraction is informative
  const mcLimits = { name: "chilled", rules: [{ id: "core-above-7.6C", channel: "core" as const, above_C: 7.6 }] };
  const thicker = { ...pack, layers: [{ name: "EPS", thickness_m: 0.025, k_W_mK: 0.035 }] };
  const spec = {
    inputs: [
      { path: "pack.layers.0.k_W_mK", plusminus: 10, percent: true, distribution: "normal" as const },
      { path: "pack.h_outside_W_m2K", plusminus: 25, percent: true, distribution: "uniform" as const },
      { path: "product.mass_kg", plusminus: 0.02, percent: false, distribution: "normal" as const },
    ],
    samples: 1000,
    seed: 1,
    use_in_guard_band: false,
  };
  monteCarlo(series, product, thicker, mcLimits, { ...spec, samples: 50 }); // warm-up: compile the hot paths first
  let mcMs = Infinity;
  let mc!: ReturnType<typeof monteCarlo>;
  for (let i = 0; i < 3; i++) {
    t0 = performance.now();
    mc = monteCarlo(series, product, thicker, mcLimits, spec);
    mcMs = Math.min(mcMs, performance.now() - t0);
  }
  console.log(`Monte Carlo: ${mc.samples} samples of a 10,000-sample lumped review in ${mcMs.toFixed(0)} ms (target < 1000, one core); 90 % band half-width ${mc.half_width_K.toFixed(3)} K; rule fails in ${(mc.fail_fraction["core-above-7.6C"]! * 100).toFixed(1)} % of samples`);
}
