import { bridgeGaps, findGaps, type TraceSeries } from "../trace/series";
import { lumpedResponse } from "../thermal/lumped";
import { screenBareProduct, readableDuration, type Screening } from "../thermal/screening";
import type { BareProduct } from "../thermal/product";
import type { LimitSet } from "../exposure/limits";
import { evaluateLimitSet, overallOutcome, type ChannelSeries, type Outcome } from "../exposure/rules";
import { meanKineticTemperature_C } from "../exposure/mkt";
import { timeBeyond } from "../exposure/timeAbove";
import type { Span } from "../exposure/window";
import { CAUTIONS } from "./cautions";

/** Bumped whenever a change to the engine could change a stored result. */
export const ENGINE_VERSION = "0.1.0";

/**
 * After a bridged gap the core still carries the bridged air for a while: its influence decays as
 * exp(−t/tau), below 1 % after 5·tau (1 − e⁻⁵ = 0.993). The core's uncertain span is extended by that.
 */
const GAP_MEMORY_TAUS = 5;

export interface ReviewInput {
  series: TraceSeries;
  product: BareProduct;
  limits: LimitSet;
}

const iso = (t_s: number) => new Date(Math.round(t_s * 1000)).toISOString();
const round = (x: number, digits: number) => Number(x.toFixed(digits));

export interface ReviewResult {
  engine_version: string;
  screening: Screening & { tau_readable: string; excursion_reading: string };
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
  outcome: Outcome;
  cautions: string[];
}

export interface ReviewComputation {
  result: ReviewResult;
  /** predicted core temperature at each sample, °C */
  core_C: Float64Array;
  /** air as used by the model (gaps bridged), °C */
  airBridged_C: Float64Array;
}

/** How the product's time constant compares with the longest air excursion of the first rule on air or core. */
function excursionReading(tau_s: number, longestAirExcursion_s: number): string {
  if (longestAirExcursion_s <= 0) return "the air did not cross the rule thresholds, so the time constant does not decide the outcome";
  const ratio = tau_s / longestAirExcursion_s;
  const both = `tau ${readableDuration(tau_s)} against a longest air excursion of ${readableDuration(longestAirExcursion_s)}`;
  // 5·tau brings a first-order body within 1 % of a step (1 − e⁻⁵); tau/5 and 5·tau bound "follows" and "barely responds".
  if (ratio < 0.2) return `the product follows the air closely (${both}): core exposure is close to air exposure`;
  if (ratio > 5) return `the product barely responds to the excursions (${both}): core exposure is much smaller than air exposure`;
  return `the product lags the air on the scale of the excursions (${both}): core exposure must be modelled`;
}

/** Runs the model and the rules over one trace. Pure and deterministic: same inputs, same bits. */
export function runReview(input: ReviewInput): ReviewComputation {
  const { series, product, limits } = input;
  const gaps = findGaps(series);
  const air = bridgeGaps(series);
  const screening = screenBareProduct(product);
  const core = lumpedResponse(series.t_s, air, product.initial_C, screening.tau_s);

  const airSpans: Span[] = gaps.map((g) => [g.start_s, g.end_s]);
  const coreSpans: Span[] = gaps.map((g) => [g.start_s, g.end_s + GAP_MEMORY_TAUS * screening.tau_s]);
  const channels: Record<"air" | "core", ChannelSeries> = {
    air: { t_s: series.t_s, value_C: air, uncertainSpans: airSpans, modelUncertainty_K: 0 },
    core: { t_s: series.t_s, value_C: core, uncertainSpans: coreSpans, modelUncertainty_K: 0 },
  };
  const findings = evaluateLimitSet(limits, channels);

  let longestAir = 0;
  for (const f of findings) {
    longestAir = Math.max(longestAir, timeBeyond(series.t_s, air, f.threshold_C, f.direction).longest_s);
  }

  const result: ReviewResult = {
    engine_version: ENGINE_VERSION,
    screening: {
      ...screening,
      tau_readable: readableDuration(screening.tau_s),
      excursion_reading: excursionReading(screening.tau_s, longestAir),
    },
    gaps: gaps.map((g) => ({ start: iso(g.start_s), end: iso(g.end_s), duration_s: g.duration_s })),
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
      air: round(meanKineticTemperature_C(series.t_s, air), 3),
      core: round(meanKineticTemperature_C(series.t_s, core), 3),
    },
    outcome: overallOutcome(findings),
    cautions: [...CAUTIONS],
  };
  return { result, core_C: core, airBridged_C: air };
}
