import { bridgeGaps, findGaps, type Gap, type TraceSeries } from "../trace/series";
import { predict, type ScreeningResult, type SolverReport } from "../thermal/predict";
import { readableDuration } from "../thermal/screening";
import type { ModelChoice, Pack, Product } from "../thermal/definitions";
import { isConsequenceRule, isThresholdRule, ruleChannel, type Channel, type LimitSet } from "../exposure/limits";
import { judgeConsequenceRule, ruleModel, unmatchedConsequenceRule, type ConsequenceRuleFinding } from "../exposure/consequenceRules";
import { evaluateConsequence, CURVE_POINTS, type ConsequenceEstimate } from "../consequence/evaluate";
import { CONSEQUENCE_CAUTIONS } from "../consequence/cautions";
import type { ConsequenceModel } from "../consequence/definitions";
import { evaluateLimitSet, overallOutcome, type ChannelSeries, type Outcome, type RuleFinding } from "../exposure/rules";
import { meanKineticTemperature_C } from "../exposure/mkt";
import { timeBeyond } from "../exposure/timeAbove";
import { clip, type Span } from "../exposure/window";
import { bandLabel, DEFAULT_BAND_EDGES_C, timeInBands } from "../exposure/bands";
import { CAUTIONS } from "./cautions";
import { monteCarlo, type UncertaintySpec } from "../uncertainty/monteCarlo";

/** Bumped whenever a change to the engine could change a stored result. */
export const ENGINE_VERSION = "0.5.0";

/**
 * Earlier engine versions whose results this engine reproduces bit for bit, given that version stamped in the
 * result: 0.5.0 only added growth and shelf-life models (issue 16), which 0.4.0 definitions cannot carry, and
 * a review without them has no `consequences` fields. verify re-runs such a review as its recorded version.
 */
export const REPRODUCIBLE_ENGINE_VERSIONS: readonly string[] = ["0.4.0"];

/** Channels every review has; "probe" exists when the trace has a product-probe column. */
export const MODELLED_CHANNELS = ["air", "core", "surface", "mean"] as const;

/**
 * After a bridged gap the product still carries the bridged air for a while: its influence decays as
 * exp(−t/tau), below 1 % after 5·tau (1 − e⁻⁵ = 0.993). Modelled channels' uncertain spans are extended by that.
 */
const GAP_MEMORY_TAUS = 5;

export interface ReviewOptions {
  model: ModelChoice;
  /** judge only this part of the trace (the model still runs from the first sample), epoch s */
  window?: { start_s: number; end_s: number };
  /** model uncertainty of the predicted channels, K (e.g. the half-width of a Monte Carlo band); widens their guard band */
  model_uncertainty_K?: number;
  /** propagate input uncertainty by seeded Monte Carlo; with use_in_guard_band, its band widens the guard band */
  uncertainty?: UncertaintySpec;
  /** channels to apply the product's growth and shelf-life models to, besides the core (and those the rules name) */
  consequence_channels?: Channel[];
  /**
   * The logger this trace came from, as the logger register states it (issue 15): its accuracy, K, is the
   * rules' sensor accuracy when the limit set states none; a calibration due before the shipment date
   * makes the outcome at best hold.
   */
  logger?: { serial: string; accuracy_K?: number; calibration_due?: string; shipment_date?: string };
}

export interface ReviewInput {
  series: TraceSeries;
  product: Product;
  pack?: Pack;
  limits: LimitSet;
  options?: ReviewOptions;
  /** pauses longer than this many median intervals are gaps (the trace's import setting) */
  gapMultiple?: number;
  /** stamp this engine version in the result (verify re-running a review of a reproducible earlier version) */
  engineVersion?: string;
}

/** One growth or shelf-life model applied to one channel over the judged window (issue 16). */
export interface ConsequenceResult {
  /** "<model>@<channel>" */
  id: string;
  /** the model's id on the product */
  model: string;
  kind: "growth" | "shelf_life";
  channel: string;
  /** growth: the organism as the product names it; the parameters' source */
  organism?: string;
  source?: string;
  log10_increase?: number;
  /** physiological state used (null: no lag) */
  q0?: number | null;
  shelf_life_consumed_days?: number;
  shelf_life_consumed_percent?: number;
  /** days left if stored at storage_C from the end of the window; null when the model predicts no spoilage there */
  remaining_days_at_C?: number | null;
  /** remaining days under the guard band: [at T + u, at T − u] */
  remaining_days_range?: [number | null, number | null];
  storage_C?: number;
  /** when the whole shelf life is used up on the central estimate, or null */
  shelf_life_ends_at?: string | null;
  /** the guard band of log10_increase (growth) or shelf_life_consumed_percent (shelf life): estimates at T − u (bridged gaps adding nothing) and T + u */
  lower: number;
  upper: number;
  guard_K: number;
  /** the same history's minutes above a threshold: the proxy beside the consequence */
  comparison: { threshold_C: number; minutes_above: number; threshold_from: string };
  /** the central cumulative log10 increase or percent consumed at up to 241 sample times (epoch s) */
  curve: { t_s: number[]; value: number[] };
}

const iso = (t_s: number) => new Date(Math.round(t_s * 1000)).toISOString();
const round = (x: number, digits: number) => Number(x.toFixed(digits));

export interface ReviewResult {
  engine_version: string;
  screening: ScreeningResult & { excursion_reading: string; lumped_vs_conduction_K: number | null };
  solver: SolverReport;
  gaps: Array<{ start: string; end: string; duration_s: number }>;
  rules: Array<{
    id: string;
    channel: string;
    direction: "above" | "below";
    threshold_C: number;
    cumulative_min: number;
    longest_continuous_min: number;
    extreme_C: number;
    guard_K: number;
    excursions: Array<{ start: string; end: string; duration_min: number; peak_C: number; degree_min: number }>;
    status: "pass" | "fail" | "inconclusive";
    reason: string;
  }>;
  mkt_C: { air: number; core: number };
  /** the judged window (the whole trace when none was chosen) */
  window: { start: string; end: string };
  /** time-temperature history: minutes in each band */
  bands: { edges_C: number[]; labels: string[]; air_min: number[]; core_min: number[] };
  /** Monte Carlo summary, when asked for: the 5–95 % core band and how often each rule fails */
  uncertainty?: { samples: number; seed: number; half_width_K: number; used_in_guard_band: boolean; fail_fraction: Record<string, number>; redraws: number; p05: number[]; p95: number[] };
  /** growth and shelf-life estimates, when the product has models or the limit set has consequence rules */
  consequences?: ConsequenceResult[];
  /** growth and shelf-life rules, judged like the threshold rules */
  consequence_rules?: Array<Omit<ConsequenceRuleFinding, "reached_at_s"> & {
    /** when the central estimate reaches the limit, or null */
    reached_at: string | null;
  }>;
  outcome: Outcome;
  cautions: string[];
}

export interface ReviewComputation {
  result: ReviewResult;
  core_C: Float64Array;
  surface_C: Float64Array;
  mean_C: Float64Array;
  coolant_C: Float64Array | null;
  /** air as used by the model (gaps bridged), °C */
  airBridged_C: Float64Array;
}

/** The air's longest continuous time beyond one rule threshold, and which threshold and rules that is. */
export interface LongestAirExcursion {
  longest_s: number;
  threshold_C: number;
  direction: "above" | "below";
  rule_ids: string[];
}

/**
 * How the product's time constant compares with the longest air excursion beyond any rule threshold.
 * The threshold is named: it can belong to a core rule, whose excursion table lists the core, not the air.
 */
function excursionReading(tau_s: number, longest: LongestAirExcursion | null): string {
  if (!longest || longest.longest_s <= 0) return "the air did not cross the rule thresholds, so the time constant does not decide the outcome";
  const ratio = tau_s / longest.longest_s;
  const rules = longest.rule_ids.length === 1 ? `rule ${longest.rule_ids[0]}` : `rules ${longest.rule_ids.join(", ")}`;
  const both = `tau ${readableDuration(tau_s)} against a longest air excursion of ${readableDuration(longest.longest_s)} ${longest.direction} ${longest.threshold_C} °C, the threshold of ${rules}`;
  // 5·tau brings a first-order body within 1 % of a step (1 − e⁻⁵); tau/5 and 5·tau bound "follows" and "barely responds".
  if (ratio < 0.2) return `the product follows the air closely (${both}): core exposure is close to air exposure`;
  if (ratio > 5) return `the product barely responds to the excursions (${both}): core exposure is much smaller than air exposure`;
  return `the product lags the air on the scale of the excursions (${both}): core exposure must be modelled`;
}

/** Checks that every rule's channel is one the review produces; returns the first offending rule. */
export function unsupportedRule(limits: LimitSet, hasProbe = false): { index: number; id: string; channel: string } | null {
  const available: readonly string[] = hasProbe ? [...MODELLED_CHANNELS, "probe"] : MODELLED_CHANNELS;
  const i = limits.rules.findIndex((r) => !available.includes(ruleChannel(r)));
  return i < 0 ? null : { index: i, id: limits.rules[i]!.id, channel: ruleChannel(limits.rules[i]!) };
}

/** Runs the model and the rules over one trace. Pure and deterministic: same inputs, same bits. */
/** Optional hooks of a long run: progress of the Monte Carlo part, as a fraction of 1. */
export interface ReviewHooks {
  onProgress?: (fraction: number) => void;
}

/** What the threshold rules judged: each rule's finding, the channels as judged (cut to the window) and the gaps. */
export interface RuleJudgement {
  findings: RuleFinding[];
  channels: Record<string, ChannelSeries> & { air: ChannelSeries; core: ChannelSeries };
  gaps: Gap[];
  /** the judged window, epoch s */
  a: number;
  b: number;
}

/** The limit set with the logger's stated accuracy where the set states none. */
function limitsWithLogger(limits: LimitSet, logger: ReviewOptions["logger"]): LimitSet {
  return limits.sensor_accuracy_K === undefined && logger?.accuracy_K !== undefined ? { ...limits, sensor_accuracy_K: logger.accuracy_K } : limits;
}

/** A caution and the outcome cap when the logger's calibration was due before the shipment date. */
function calibrationCheck(logger: ReviewOptions["logger"]): string | null {
  if (!logger?.calibration_due || !logger.shipment_date) return null;
  if (!(Date.parse(logger.calibration_due) < Date.parse(logger.shipment_date))) return null;
  return `Logger ${logger.serial} was due for calibration on ${logger.calibration_due.slice(0, 10)}, before the shipment date ${logger.shipment_date.slice(0, 10)}: its readings are not covered by a current calibration, so the outcome is at best hold.`;
}

/**
 * The threshold rules over a trace and its predicted channels, as a review judges them: air bridged across
 * gaps (uncertain there), modelled channels uncertain for GAP_MEMORY_TAUS·tau after a gap, the probe on its
 * own gaps. A live monitor judges its readings so far with this same function.
 */
export function judgeRules(series: TraceSeries, air: Float64Array, pred: { core: Float64Array; surface: Float64Array; mean: Float64Array }, tau: number, limits: LimitSet, options: Pick<ReviewOptions, "window">, modelUncertainty: number, gapMultiple?: number): RuleJudgement {
  const gaps = findGaps(series, gapMultiple);
  const airSpans: Span[] = gaps.map((g) => [g.start_s, g.end_s]);
  const modelSpans: Span[] = gaps.map((g) => [g.start_s, g.end_s + GAP_MEMORY_TAUS * tau]);
  const t0 = series.t_s[0]!, t1 = series.t_s[series.t_s.length - 1]!;
  const win = options.window;
  if (win && !(win.start_s >= t0 && win.end_s <= t1 && win.end_s > win.start_s)) {
    throw new RangeError(`the window ${iso(win.start_s)}/${iso(win.end_s)} is not inside the trace (${iso(t0)}/${iso(t1)})`);
  }
  const [a, b] = win ? [win.start_s, win.end_s] : [t0, t1];
  const cut = (v: Float64Array) => (win ? clip(series.t_s, v, a, b) : { t_s: series.t_s, v });
  const inWindow = (spans: Span[]) => spans.filter(([s0, s1]) => s1 > a && s0 < b);
  const channel = (v: Float64Array, spans: Span[], modelled: boolean): ChannelSeries => {
    const c = cut(v);
    return { t_s: c.t_s, value_C: c.v, uncertainSpans: inWindow(spans), modelUncertainty_K: modelled ? modelUncertainty : 0 };
  };
  const channels: Record<string, ChannelSeries> & { air: ChannelSeries; core: ChannelSeries } = {
    air: channel(air, airSpans, false),
    core: channel(pred.core, modelSpans, true),
    surface: channel(pred.surface, modelSpans, true),
    mean: channel(pred.mean, modelSpans, true),
  };
  if (series.probe_C && series.probe_C.some((v) => !Number.isNaN(v))) {
    // the probe is measured: its own gaps (including missing ends) are its uncertain spans
    const probeSpans: Span[] = findGaps(series, gapMultiple, series.probe_C).map((g) => [g.start_s, g.end_s]);
    const first = series.probe_C.findIndex((v) => !Number.isNaN(v));
    let last = series.probe_C.length - 1;
    while (Number.isNaN(series.probe_C[last]!)) last--;
    const filled = Float64Array.from(series.probe_C);
    for (let i = 0; i < first; i++) filled[i] = series.probe_C[first]!;
    for (let i = last + 1; i < filled.length; i++) filled[i] = series.probe_C[last]!;
    if (first > 0) probeSpans.push([series.t_s[0]!, series.t_s[first]!]);
    if (last < filled.length - 1) probeSpans.push([series.t_s[last]!, series.t_s[filled.length - 1]!]);
    channels.probe = channel(bridgeGaps(series, filled), probeSpans, false);
  }
  return { findings: evaluateLimitSet(limits, channels), channels, gaps, a, b };
}

export function runReview(input: ReviewInput, hooks: ReviewHooks = {}): ReviewComputation {
  const { series, product, pack } = input;
  const options = input.options ?? { model: "auto" };
  const limits = limitsWithLogger(input.limits, options.logger);
  const overdue = calibrationCheck(options.logger);
  const air = bridgeGaps(series);
  const pred = predict(product, pack, series.t_s, air, { model: options.model });
  const tau = pred.screening.tau_s;
  const mc = options.uncertainty ? monteCarlo({ t_s: series.t_s, air_C: air }, product, pack, limits, options.uncertainty, options.model, { onProgress: hooks.onProgress }) : null;
  const modelUncertainty = mc && options.uncertainty!.use_in_guard_band ? mc.half_width_K : (options.model_uncertainty_K ?? 0);
  const { findings, channels, gaps, a, b } = judgeRules(series, air, pred, tau, limits, options, modelUncertainty, input.gapMultiple);
  const cons = consequences(product.consequences ?? [], limits, channels, options.consequence_channels ?? [], product.initial_C);

  let longestAir: LongestAirExcursion | null = null;
  for (const f of findings) {
    const longest_s = timeBeyond(channels.air.t_s, channels.air.value_C, f.threshold_C, f.direction).longest_s;
    if (longestAir && longestAir.threshold_C === f.threshold_C && longestAir.direction === f.direction) longestAir.rule_ids.push(f.id);
    else if (!longestAir || longest_s > longestAir.longest_s) longestAir = { longest_s, threshold_C: f.threshold_C, direction: f.direction, rule_ids: [f.id] };
  }
  const edges = [...DEFAULT_BAND_EDGES_C];
  const minutes = (ch: ChannelSeries) => timeInBands(ch.t_s, ch.value_C, edges).map((s) => round(s / 60, 3));

  const result: ReviewResult = {
    engine_version: input.engineVersion ?? ENGINE_VERSION,
    screening: { ...pred.screening, excursion_reading: excursionReading(tau, longestAir), lumped_vs_conduction_K: pred.lumped_vs_conduction_K },
    solver: pred.solver,
    gaps: gaps.filter((g) => g.end_s > a && g.start_s < b).map((g) => ({ start: iso(g.start_s), end: iso(g.end_s), duration_s: g.duration_s })),
    rules: findings.map((f) => ({
      id: f.id,
      channel: f.channel,
      direction: f.direction,
      threshold_C: f.threshold_C,
      cumulative_min: round(f.cumulative_s / 60, 3),
      longest_continuous_min: round(f.longest_s / 60, 3),
      extreme_C: round(f.extreme_C, 3),
      guard_K: f.guard_K,
      excursions: f.excursions.map((e) => ({
        start: iso(e.start_s),
        end: iso(e.end_s),
        duration_min: round(e.duration_s / 60, 3),
        peak_C: round(e.peak_C, 3),
        degree_min: round(e.area_Ks / 60, 3),
      })),
      status: f.status,
      reason: f.reason,
    })),
    mkt_C: {
      air: round(meanKineticTemperature_C(channels.air.t_s, channels.air.value_C), 3),
      core: round(meanKineticTemperature_C(channels.core.t_s, channels.core.value_C), 3),
    },
    window: { start: iso(a), end: iso(b) },
    bands: { edges_C: edges, labels: edges.map((_, k) => bandLabel(edges, k)).concat(bandLabel(edges, edges.length)), air_min: minutes(channels.air), core_min: minutes(channels.core) },
    ...(mc
      ? {
          uncertainty: {
            samples: mc.samples,
            seed: mc.seed,
            half_width_K: round(mc.half_width_K, 4),
            used_in_guard_band: options.uncertainty!.use_in_guard_band,
            fail_fraction: mc.fail_fraction,
            redraws: mc.redraws,
            p05: Array.from(mc.p05, (x) => round(x, 3)),
            p95: Array.from(mc.p95, (x) => round(x, 3)),
          },
        }
      : {}),
    ...(cons ? { consequences: cons.results } : {}),
    ...(cons && cons.rules.length > 0 ? { consequence_rules: cons.rules } : {}),
    outcome: overdue && overallOutcome([...findings, ...(cons?.rules ?? [])]) === "accept" ? "hold" : overallOutcome([...findings, ...(cons?.rules ?? [])]),
    // what the model assumed that the reader must know (estimated freezing point, coolant treatment, 1-D shortcut)
    cautions: [
      ...CAUTIONS,
      ...pred.screening.notes,
      ...(cons ? CONSEQUENCE_CAUTIONS : []),
      ...(limits !== input.limits ? [`The sensor accuracy, ±${limits.sensor_accuracy_K} K, is the stated accuracy of logger ${options.logger!.serial} in the logger register (the limit set states none).`] : []),
      ...(overdue ? [overdue] : []),
    ],
  };
  return { result, core_C: pred.core, surface_C: pred.surface, mean_C: pred.mean, coolant_C: pred.coolant, airBridged_C: air };
}

/** Without a threshold rule above on the channel, the comparison uses 5 °C: cold holding in the US FDA Food Code, §3-501.16. */
const DEFAULT_COMPARISON_C = 5;

/** Evenly spaced sample indices (first and last included) of a monotone cumulative curve, for the stored result. */
function curveOf(t_s: Float64Array, v: Float64Array, points = CURVE_POINTS): { t_s: number[]; value: number[] } {
  const n = t_s.length;
  const idx = n <= points ? Array.from({ length: n }, (_, i) => i) : Array.from({ length: points }, (_, k) => Math.round((k * (n - 1)) / (points - 1)));
  return { t_s: idx.map((i) => t_s[i]!), value: idx.map((i) => round(v[i]!, 6)) };
}

/**
 * The product's growth and shelf-life models on the core (always), on the channels asked for, and on the channels
 * the consequence rules name; then the consequence rules. Null when there is nothing of the kind (the result then
 * has no consequence fields, as before engine 0.5.0).
 */
function consequences(models: readonly ConsequenceModel[], limits: LimitSet, channels: Record<string, ChannelSeries>, extra: readonly Channel[], initial_C: number) {
  const rules = limits.rules.filter(isConsequenceRule);
  if (models.length === 0 && rules.length === 0) return null;
  const bad = unmatchedConsequenceRule(limits, models);
  if (bad) throw new Error(bad.message);
  const wanted: Array<{ model: ConsequenceModel; channel: string }> = [];
  const add = (model: ConsequenceModel, channel: string) => {
    if (!wanted.some((w) => w.model.id === model.id && w.channel === channel)) wanted.push({ model, channel });
  };
  for (const m of models) add(m, "core");
  for (const c of extra) for (const m of models) add(m, c);
  for (const r of rules) {
    const m = ruleModel(r, models);
    if (m.ok) add(m.model, ruleChannel(r));
  }
  const sensor = limits.sensor_accuracy_K ?? 0;
  const estimates = new Map<string, ConsequenceEstimate>();
  const results: ConsequenceResult[] = wanted.map(({ model, channel }) => {
    const ch = channels[channel];
    if (!ch) throw new Error(`the ${channel} channel is not available for consequence model '${model.id}'`);
    const est = evaluateConsequence(model, ch, sensor + ch.modelUncertainty_K, initial_C);
    estimates.set(`${model.id}@${channel}`, est);
    const rule = limits.rules.find((r) => isThresholdRule(r) && r.channel === channel && r.above_C !== undefined);
    const threshold_C = rule && isThresholdRule(rule) ? rule.above_C! : DEFAULT_COMPARISON_C;
    const comparison = {
      threshold_C,
      minutes_above: round(timeBeyond(ch.t_s, ch.value_C, threshold_C, "above").cumulative_s / 60, 3),
      threshold_from: rule ? `rule ${rule.id}` : "5 °C, cold holding in the US FDA Food Code §3-501.16 (no rule above a threshold on this channel)",
    };
    const common = { id: `${model.id}@${channel}`, model: model.id, kind: model.kind, channel, lower: round(est.lower, 6), upper: round(est.upper, 6), guard_K: est.guard_K, comparison, curve: curveOf(ch.t_s, est.cumulative) };
    if (model.kind === "growth") {
      return { ...common, organism: model.organism, source: model.source, log10_increase: round(est.central, 6), q0: est.q0 ?? null };
    }
    const rd = (x: number | null | undefined) => (x === null || x === undefined ? null : round(x, 4));
    return {
      ...common,
      shelf_life_consumed_days: round(est.shelf_life_consumed_days!, 6),
      shelf_life_consumed_percent: round(est.central, 6),
      remaining_days_at_C: rd(est.remaining_days_at_C),
      remaining_days_range: [rd(est.remaining_days_range![0]), rd(est.remaining_days_range![1])],
      storage_C: est.storage_C!,
      shelf_life_ends_at: est.ends_at_s === null || est.ends_at_s === undefined ? null : iso(est.ends_at_s),
    };
  });
  const judged = rules.map((r) => {
    const m = ruleModel(r, models);
    if (!m.ok) throw new Error(m.message);
    const channel = ruleChannel(r);
    const f = judgeConsequenceRule(r, estimates.get(`${m.model.id}@${channel}`)!, channels[channel]!.uncertainSpans.length);
    return {
      id: f.id, kind: f.kind, model: f.model, channel: f.channel, quantity: f.quantity, limit: f.limit,
      central: round(f.central, 6), lower: round(f.lower, 6), upper: round(f.upper, 6), guard_K: f.guard_K,
      reached_at: f.reached_at_s === null ? null : iso(f.reached_at_s), status: f.status, reason: f.reason,
    };
  });
  return { results, rules: judged };
}
