import type { Forecast } from "./forecast";
import type { RuleRunning } from "./monitor";
import { isThresholdRule, type LimitSet, type ThresholdRule } from "../exposure/limits";

/**
 * What the live page says about thresholds, in words that keep two things apart which a user walkthrough
 * found merged into "limit already reached": a channel being beyond a rule's threshold now (the rule's
 * allowance is being used, and the rule may still pass), and the rule's allowance being used up. The
 * forecast computes only when a threshold is crossed (lib/live/forecast.ts), never when an allowance runs
 * out, and its words say so.
 */
export interface ThresholdWords {
  /**
   * one sentence per threshold rule on a modelled channel that is beyond its threshold at the last reading;
   * `usedUp` when that rule's allowance is used up or the rule fails so far
   */
  now: Array<{ rule: string; text: string; usedUp: boolean }>;
  /**
   * the rules so far, first: a rule that fails so far cannot pass again whatever the next readings (its time,
   * stretch or peak beyond the threshold only grows), so that leads, ahead of the thresholds at this moment
   */
  verdict: { text: string; failed: boolean };
  /** the forecast: the time until a threshold is crossed, or why none is given */
  forecast: string;
  /** a crossing is forecast within the alert lead */
  soon: boolean;
}

const MODELLED = ["core", "surface", "mean"] as const;
type Modelled = (typeof MODELLED)[number];

const c = (x: number) => `${Number(x.toFixed(2))} °C`;
const min1 = (x: number) => `${x.toFixed(1)} min`;
const STATUS_WORDS: Record<RuleRunning["status_so_far"], string> = {
  pass: "still passes",
  fail: "fails",
  inconclusive: "is inconclusive so far (within the guard band)",
};

/** A duration as the live page writes it: seconds under 1.5 min, minutes under 2 h, else hours. */
export function spanWords(m: number): string {
  return m < 1 / 60 ? "under a second" : m < 1.5 ? `${Math.round(m * 60)} s` : m < 120 ? `${Math.round(m)} min` : `${(m / 60).toFixed(1)} h`;
}

function beyond(v: number, r: ThresholdRule): boolean {
  return r.above_C !== undefined ? v > r.above_C : v < r.below_C!;
}

/** "The core is above 8 °C now (42.0 min of the 180 min allowance used, 138.0 min left): rule core-8 still passes." */
function nowSentence(r: ThresholdRule, value_C: number, running: RuleRunning | undefined): string {
  const dir = r.above_C !== undefined ? "above" : "below";
  const head = `The ${r.channel} is ${dir} ${c((r.above_C ?? r.below_C)!)} now (${c(value_C)})`;
  const status = running ? `rule ${r.id} ${STATUS_WORDS[running.status_so_far]}` : `rule ${r.id}`;
  if (r.max_cumulative_min !== undefined && running) {
    const left = running.remaining_min ?? 0;
    if (left > 0) return `${head}: ${min1(running.cumulative_min)} of the ${r.max_cumulative_min} min allowance used, ${min1(left)} left; ${status}.`;
    return `${head}, and the ${r.max_cumulative_min} min allowance is used up (${min1(running.cumulative_min)} beyond it so far); ${status}.`;
  }
  if (r.max_continuous_min !== undefined) return `${head}; the rule allows at most ${r.max_continuous_min} min at a stretch; ${status}.`;
  if (r.max_peak_C !== undefined) return `${head}; the rule allows no value beyond ${c(r.max_peak_C)}; ${status}.`;
  return `${head}; the rule allows no time beyond it; ${status}.`;
}

/**
 * The threshold sentences for the live page from the limit set, the rules judged so far, the modelled
 * channels at the last reading and the forecast; `lead_min` is the monitor's alert lead.
 */
export function thresholdWords(limits: LimitSet, rules: readonly RuleRunning[], last: Record<Modelled, number> | null, fc: Forecast | null, lead_min: number): ThresholdWords {
  const running = new Map(rules.map((r) => [r.id, r]));
  const beyondNow = last
    ? limits.rules.filter(isThresholdRule).filter((r) => (MODELLED as readonly string[]).includes(r.channel) && beyond(last[r.channel as Modelled], r))
    : [];
  const now = beyondNow.map((r) => {
    const s = running.get(r.id);
    const usedUp = s?.status_so_far === "fail" || (r.max_cumulative_min !== undefined && (s?.remaining_min ?? 0) <= 0);
    return { rule: r.id, text: nowSentence(r, last![r.channel as Modelled], s), usedUp };
  });
  const failed = rules.filter((r) => r.status_so_far === "fail");
  const unsure = rules.filter((r) => r.status_so_far === "inconclusive");
  const verdict = failed.length
    ? { failed: true, text: `${failed.length === 1 ? "Rule" : "Rules"} ${failed.map((r) => r.id).join(", ")} ${failed.length === 1 ? "has" : "have"} failed: no later reading can bring ${failed.length === 1 ? "it" : "them"} back to a pass. Decide on the load now.` }
    : unsure.length
      ? { failed: false, text: `No rule has failed so far; ${unsure.map((r) => r.id).join(", ")} ${unsure.length === 1 ? "is" : "are"} inconclusive (within the guard band).` }
      : { failed: false, text: rules.length ? "Every rule passes so far." : "No rules judged yet." };
  let forecast: string;
  let soon = false;
  if (!fc) forecast = "needs readings";
  else if (fc.minutes_to_limit === null) forecast = "no threshold crossing forecast";
  else if (fc.minutes_to_limit === 0) {
    forecast = `no crossing to forecast: the ${fc.channel} is already beyond ${c(fc.threshold_C!)}. The time until an allowance runs out is not forecast.`;
  } else {
    soon = fc.minutes_to_limit <= lead_min;
    const rule = limits.rules.find((r) => r.id === fc.limit_rule);
    const dir = rule && isThresholdRule(rule) && rule.below_C !== undefined ? "below" : "above";
    forecast = `the ${fc.channel} goes ${dir} ${c(fc.threshold_C!)} (rule ${fc.limit_rule}'s threshold) in ${spanWords(fc.minutes_to_limit)} if the air holds at ${c(fc.assumed_air_C)}; this is when the threshold is crossed, not when an allowance runs out`;
  }
  return { now, verdict, forecast, soon };
}
