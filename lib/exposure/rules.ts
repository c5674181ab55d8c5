import { isThresholdRule, type LimitSet, type ThresholdRule as Rule } from "./limits";
import { timeBeyond, type Excursion, type ExposureSummary } from "./timeAbove";
import { partsOutside, type Span } from "./window";

export type RuleStatus = "pass" | "fail" | "inconclusive";
export type Outcome = "accept" | "hold" | "reject";

/** A channel to judge: its series and the spans where it rests on bridged (not measured) data. */
export interface ChannelSeries {
  t_s: Float64Array;
  value_C: Float64Array;
  uncertainSpans: readonly Span[];
  /** model uncertainty of this channel, K (0 for a measured channel) */
  modelUncertainty_K: number;
}

export interface RuleFinding {
  id: string;
  channel: Rule["channel"];
  direction: "above" | "below";
  threshold_C: number;
  /** nominal measures, at the threshold as written */
  cumulative_s: number;
  longest_s: number;
  /** highest value for an "above" rule, lowest for a "below" rule, °C */
  extreme_C: number;
  excursions: Excursion[];
  /** half-width of the guard band used, K */
  guard_K: number;
  status: RuleStatus;
  reason: string;
}

interface Measure {
  cumulative_s: number;
  longest_s: number;
  extreme_C: number;
}

function extremeOf(v: Float64Array, dir: "above" | "below"): number {
  let hi = -Infinity, lo = Infinity;
  for (let i = 0; i < v.length; i++) {
    const x = v[i]!;
    if (x > hi) hi = x;
    if (x < lo) lo = x;
  }
  return dir === "above" ? hi : lo;
}

function measure(t_s: Float64Array, v: Float64Array, threshold: number, dir: "above" | "below"): Measure {
  const s: ExposureSummary = timeBeyond(t_s, v, threshold, dir);
  return { cumulative_s: s.cumulative_s, longest_s: s.longest_s, extreme_C: extremeOf(v, dir) };
}

/** Which allowances a measure exceeds, in words; empty when within every allowance. */
function exceeded(rule: Rule, m: Measure, dir: "above" | "below", peakShift_K: number): string[] {
  const out: string[] = [];
  const noAllowance = rule.max_cumulative_min === undefined && rule.max_continuous_min === undefined && rule.max_peak_C === undefined;
  const cumMin = m.cumulative_s / 60;
  const longMin = m.longest_s / 60;
  if (noAllowance && m.cumulative_s > 0) out.push(`${fmt(cumMin)} min beyond, none allowed`);
  if (rule.max_cumulative_min !== undefined && cumMin > rule.max_cumulative_min) {
    out.push(`${fmt(cumMin)} min cumulative > ${rule.max_cumulative_min} min allowed`);
  }
  if (rule.max_continuous_min !== undefined && longMin > rule.max_continuous_min) {
    out.push(`${fmt(longMin)} min continuous > ${rule.max_continuous_min} min allowed`);
  }
  if (rule.max_peak_C !== undefined) {
    // The guard band moves the comparison, never the measured value: say both separately.
    const extreme = m.extreme_C + (dir === "above" ? peakShift_K : -peakShift_K);
    if (dir === "above" ? extreme > rule.max_peak_C : extreme < rule.max_peak_C) {
      const word = dir === "above" ? "peak" : "lowest";
      const limit = `${rule.max_peak_C} °C`;
      const band = `${fmt2(Math.abs(peakShift_K))} K guard band`;
      if (peakShift_K > 0) out.push(`${word} ${fmt2(m.extreme_C)} °C is within the ${band} of the ${limit} limit`);
      else if (peakShift_K < 0) out.push(`${word} ${fmt2(m.extreme_C)} °C is beyond the ${limit} limit by more than the ${band}`);
      else out.push(`${word} ${fmt2(m.extreme_C)} °C beyond ${limit}`);
    }
  }
  return out;
}

const fmt = (x: number) => Number(x.toFixed(1)).toString();
/** Temperatures a rule compares with a limit: to 0.01 K, so a peak of 7.65 °C is not shown as 7.7 °C. */
const fmt2 = (x: number) => Number(x.toFixed(2)).toString();

/**
 * Judges one rule with a guard band u = sensor accuracy + model uncertainty, in the manner of the
 * ISO 14253-1 decision rules: "pass" must hold with the threshold moved by u against the shipment,
 * "fail" must hold with it moved by u in the shipment's favour, and anything between is
 * "inconclusive". Time that rests on bridged data is left out of the "fail" test, and a rule whose
 * channel crosses bridged data can at best be inconclusive.
 */
export function evaluateRule(rule: Rule, ch: ChannelSeries, sensorAccuracy_K: number): RuleFinding {
  const dir: "above" | "below" = rule.above_C !== undefined ? "above" : "below";
  const threshold_C = (rule.above_C ?? rule.below_C)!;
  const u = sensorAccuracy_K + ch.modelUncertainty_K;
  const against = dir === "above" ? -u : u; // moves the threshold so that more time counts
  const nominal = timeBeyond(ch.t_s, ch.value_C, threshold_C, dir);
  const nominalMeasure: Measure = { cumulative_s: nominal.cumulative_s, longest_s: nominal.longest_s, extreme_C: extremeOf(ch.value_C, dir) };
  // Without a guard band the strict and lenient thresholds are the written one: measure once.
  const strict = u === 0 ? nominalMeasure : measure(ch.t_s, ch.value_C, threshold_C + against, dir);
  const strictExceeds = exceeded(rule, strict, dir, u);

  // Lenient measure on measured data only: each part outside the bridged spans on its own.
  let lenient: Measure;
  let hasParts = true;
  if (ch.uncertainSpans.length === 0) lenient = u === 0 ? nominalMeasure : measure(ch.t_s, ch.value_C, threshold_C - against, dir);
  else {
    const parts = partsOutside(ch.t_s, ch.value_C, ch.uncertainSpans);
    hasParts = parts.length > 0;
    lenient = { cumulative_s: 0, longest_s: 0, extreme_C: dir === "above" ? -Infinity : Infinity };
    for (const p of parts) {
      const m = measure(p.t_s, p.v, threshold_C - against, dir);
      lenient.cumulative_s += m.cumulative_s;
      lenient.longest_s = Math.max(lenient.longest_s, m.longest_s);
      lenient.extreme_C = dir === "above" ? Math.max(lenient.extreme_C, m.extreme_C) : Math.min(lenient.extreme_C, m.extreme_C);
    }
  }
  const lenientExceeds = hasParts ? exceeded(rule, lenient, dir, -u) : [];

  const fmtC = (x: number) => `${fmt(x)} °C`;
  let status: RuleStatus;
  let reason: string;
  if (lenientExceeds.length > 0) {
    status = "fail";
    reason =
      u > 0
        ? `fails even with the threshold moved ${fmt(u)} K in the shipment's favour (to ${fmtC(threshold_C - against)}): ${lenientExceeds.join("; ")}`
        : `fails: ${lenientExceeds.join("; ")}`;
  } else if (strictExceeds.length > 0) {
    status = "inconclusive";
    reason = `inside the ±${fmt(u)} K guard band: within the limits with the threshold at ${fmtC(threshold_C - against)}, not with it at ${fmtC(threshold_C + against)} (${strictExceeds.join("; ")})`;
  } else if (ch.uncertainSpans.length > 0) {
    status = "inconclusive";
    reason = `within the limits, but judged across ${ch.uncertainSpans.length} data gap(s) bridged by linear interpolation`;
  } else {
    status = "pass";
    reason = u > 0 ? `passes with the threshold moved ${fmt(u)} K against the shipment (to ${fmtC(threshold_C + against)})` : "passes";
  }
  return {
    id: rule.id,
    channel: rule.channel,
    direction: dir,
    threshold_C,
    cumulative_s: nominal.cumulative_s,
    longest_s: nominal.longest_s,
    extreme_C: nominalMeasure.extreme_C,
    excursions: nominal.excursions,
    guard_K: u,
    status,
    reason,
  };
}

/** accept when every rule passes, reject when any fails, hold for review otherwise. */
export function overallOutcome(findings: readonly { status: RuleStatus }[]): Outcome {
  if (findings.some((f) => f.status === "fail")) return "reject";
  if (findings.every((f) => f.status === "pass")) return "accept";
  return "hold";
}

/** Judges the limit set's threshold rules (consequence rules: consequenceRules.ts). */
export function evaluateLimitSet(limits: LimitSet, channels: Partial<Record<string, ChannelSeries>>): RuleFinding[] {
  return limits.rules.filter(isThresholdRule).map((rule) => {
    const ch = channels[rule.channel];
    if (!ch) throw new Error(`rule '${rule.id}' needs the '${rule.channel}' channel, which this review does not have`);
    return evaluateRule(rule, ch, limits.sensor_accuracy_K ?? 0);
  });
}
