import { z } from "zod";
import type { TraceSeries } from "../trace/series";
import { bridgeGaps, selectKth } from "../trace/series";
import type { ModelChoice, Pack, Product } from "../thermal/definitions";
import { predict } from "../thermal/predict";
import { isConsequenceRule, ruleChannel, type LimitSet } from "../exposure/limits";
import { ruleModel } from "../exposure/consequenceRules";
import { evaluateConsequence } from "../consequence/evaluate";
import { evaluateLimitSet, type ChannelSeries } from "../exposure/rules";
import { mulberry32, normalSource } from "./random";
import { capped, quantity, strictObject } from "../quantity";

export const MAX_UNCERTAIN_INPUTS = 50;

export const uncertainInputSchema = strictObject({
  /** where the value sits, e.g. "product.properties.cp_J_kgK", "product.mass_kg", "pack.h_outside_W_m2K", "pack.layers.0.k_W_mK" (indices from 0) */
  path: z.string().regex(/^(product|pack)(\.[A-Za-z_0-9]+)+$/, { message: "path must look like product.mass_kg or pack.layers.0.k_W_mK" }),
  /** half-width (uniform) or one standard deviation (normal), absolute or in percent */
  plusminus: quantity("plusminus", "", 0, 1e6),
  percent: z.boolean().default(false),
  distribution: z.enum(["uniform", "normal"], { error: "distribution must be uniform or normal" }).default("normal"),
}).refine((u) => !u.percent || u.plusminus <= 100, { message: "plusminus in percent must be at most 100", path: ["plusminus"] });
export const uncertaintySpecSchema = strictObject({
  inputs: capped(uncertainInputSchema, "uncertain inputs", MAX_UNCERTAIN_INPUTS, 1),
  samples: quantity("samples", "", 10, 20_000).int({ message: "samples must be a whole number" }).default(500),
  seed: quantity("seed", "", 0, 4_294_967_295).int({ message: "seed must be a whole number" }).default(1),
  /** use the half-width of the 90 % core band as the model uncertainty in the rules' guard band */
  use_in_guard_band: z.boolean().default(false),
});
export type UncertaintySpec = z.infer<typeof uncertaintySpecSchema>;

export interface UncertaintyResult {
  samples: number;
  seed: number;
  /** 5th, 50th and 95th percentile of the predicted core temperature at each trace sample, °C */
  p05: Float64Array;
  p50: Float64Array;
  p95: Float64Array;
  /** half-width of the widest 5–95 % band, K: the model uncertainty the rules can use */
  half_width_K: number;
  /** per rule, the fraction of samples in which it fails (nominal threshold or growth/shelf-life estimate, no guard band) */
  fail_fraction: Record<string, number>;
  /** draws repeated because they gave a non-positive value for a positive quantity */
  redraws: number;
  cancelled: boolean;
}

function getAt(obj: unknown, parts: string[]): unknown {
  return parts.reduce<unknown>((o, k) => (o && typeof o === "object" ? (o as Record<string, unknown>)[k] : undefined), obj);
}

function setAt(obj: Record<string, unknown>, parts: string[], value: number): void {
  let o: Record<string, unknown> = obj;
  for (const k of parts.slice(0, -1)) o = o[k] as Record<string, unknown>;
  o[parts[parts.length - 1]!] = value;
}


/**
 * Propagates input uncertainty by Monte Carlo with a seeded generator (same seed, same result):
 * each sample draws every uncertain input, predicts the core through the trace and judges the rules.
 * Positive quantities that draw to zero or below are drawn again (counted in `redraws`).
 * Percentiles use the nearest-rank method.
 */
export function monteCarlo(
  series: TraceSeries,
  product: Product,
  pack: Pack | undefined,
  limits: LimitSet | undefined,
  spec: UncertaintySpec,
  model: ModelChoice = "auto",
  hooks: { onProgress?: (fraction: number) => void; cancelled?: () => boolean } = {},
): UncertaintyResult {
  const air = bridgeGaps(series);
  const n = series.t_s.length;
  const rand = mulberry32(spec.seed);
  const gauss = normalSource(rand);
  const base = { product, pack } as Record<string, unknown>;
  const nominal = spec.inputs.map((u) => {
    const parts = u.path.split(".");
    const v = getAt(base, parts);
    if (typeof v !== "number") throw new Error(`uncertain input '${u.path}' does not name a number in the definitions`);
    return { parts, v };
  });
  const cores = new Float64Array(spec.samples * n);
  const fails: Record<string, number> = Object.fromEntries((limits?.rules ?? []).map((r) => [r.id, 0]));
  let redraws = 0;
  let done = 0;
  for (let s = 0; s < spec.samples; s++) {
    if (hooks.cancelled?.()) break;
    const defs = JSON.parse(JSON.stringify(base)) as Record<string, unknown>;
    spec.inputs.forEach((u, j) => {
      const { parts, v } = nominal[j]!;
      const scale = u.percent ? (Math.abs(v) * u.plusminus) / 100 : u.plusminus;
      const mustBePositive = v > 0 && !/_C$/.test(parts[parts.length - 1]!);
      for (let tries = 0; ; tries++) {
        const d = u.distribution === "uniform" ? (2 * rand() - 1) * scale : gauss() * scale;
        if (!mustBePositive || v + d > 0 || tries > 100) {
          setAt(defs, parts, v + d);
          break;
        }
        redraws++;
      }
    });
    const p = predict(defs.product as Product, defs.pack as Pack | undefined, series.t_s, air, { model });
    cores.set(p.core, s * n);
    if (limits) {
      const ch = (v: Float64Array): ChannelSeries => ({ t_s: series.t_s, value_C: v, uncertainSpans: [], modelUncertainty_K: 0 });
      const channels: Record<string, ChannelSeries> = { air: ch(air), core: ch(p.core), surface: ch(p.surface), mean: ch(p.mean) };
      const found = evaluateLimitSet({ ...limits, sensor_accuracy_K: 0 }, channels);
      for (const f of found) if (f.status === "fail") fails[f.id] = fails[f.id]! + 1;
      // growth and shelf-life rules: the sample fails when its estimate (no guard band) exceeds the limit
      const sampled = defs.product as Product;
      for (const r of limits.rules.filter(isConsequenceRule)) {
        const m = ruleModel(r, sampled.consequences ?? []);
        if (!m.ok) throw new Error(m.message);
        const c = channels[ruleChannel(r)];
        if (!c) throw new Error(`rule '${r.id}' needs the '${ruleChannel(r)}' channel, which a Monte Carlo sample does not have`);
        const est = evaluateConsequence(m.model, c, 0, sampled.initial_C);
        if (est.central > (r.kind === "growth" ? r.max_log10_increase : r.max_consumed_percent)) fails[r.id] = fails[r.id]! + 1;
      }
    }
    done++;
    if (hooks.onProgress && (s & 15) === 0) hooks.onProgress(done / spec.samples);
  }
  const p05 = new Float64Array(n), p50 = new Float64Array(n), p95 = new Float64Array(n);
  const rank = (q: number) => Math.min(done - 1, Math.max(0, Math.ceil(q * done) - 1));
  let half = 0;
  const column = new Float64Array(done);
  for (let i = 0; i < n; i++) {
    for (let s = 0; s < done; s++) column[s] = cores[s * n + i]!;
    p05[i] = selectKth(column, rank(0.05));
    p50[i] = selectKth(column, rank(0.5));
    p95[i] = selectKth(column, rank(0.95));
    half = Math.max(half, (p95[i]! - p05[i]!) / 2);
  }
  hooks.onProgress?.(1);
  return {
    samples: done,
    seed: spec.seed,
    p05, p50, p95,
    half_width_K: half,
    fail_fraction: Object.fromEntries(Object.entries(fails).map(([k, v]) => [k, done ? v / done : 0])),
    redraws,
    cancelled: done < spec.samples,
  };
}
