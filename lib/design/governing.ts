import { isConsequenceRule, ruleChannel, type Rule } from "../exposure/limits";
import type { RuleMeasure } from "./sizing";

/** What a sizing chart plots for the rule that sets the boundary, and where that rule's limit lies. */
export interface GoverningCurve {
  rule_id: string;
  /** which measure of each curve point to plot */
  quantity: "extreme_C" | "cumulative_min" | "longest_min" | "consequence";
  /** axis label in words and units: "peak core temperature, °C", "time of the core above 4.5 °C, min" */
  label: string;
  /** what the label's threshold is, when the guard band moved it: "4.5 °C is the 5 °C threshold less the 0.5 K guard band" */
  note: string | null;
  /** the rule's limit on that quantity, as written */
  limit: { value: number; label: string };
  /** where a pass must stay once the guard band is taken off a peak limit; null for time limits (their measure already includes it) */
  pass: { value: number; label: string } | null;
}

const r2 = (x: number) => Number(x.toFixed(2));

/**
 * The allowance of a rule that decides it at one point of the curve (the first one exceeded there, in
 * the order peak, cumulative, continuous), as a quantity to plot against the design variable with its
 * limit line. A rule without allowances allows no time beyond its threshold: its quantity is the peak,
 * limited by the threshold itself. Time measures are those of the pass test (threshold moved by the
 * guard band u against the shipment, lib/exposure/rules.ts), so the curve crosses the limit where the
 * rule starts to pass.
 */
export function governingCurve(rule: Rule, u_K: number, at: RuleMeasure): GoverningCurve {
  if (isConsequenceRule(rule)) {
    // the consequence at T + u (the pass test's side of the guard band), against the rule's limit
    const growth = rule.kind === "growth";
    const limit = growth ? rule.max_log10_increase : rule.max_consumed_percent;
    return {
      rule_id: rule.id,
      quantity: "consequence",
      label: growth ? `log10 increase of ${rule.model} on the ${ruleChannel(rule)}, log10` : `shelf life consumed on the ${ruleChannel(rule)}, %`,
      note: u_K > 0 ? `estimated with the ${ruleChannel(rule)} ${u_K} K warmer (the guard band)` : null,
      limit: { value: limit, label: `${rule.id}: ≤ ${limit}${growth ? " log10" : " %"}` },
      pass: null,
    };
  }
  const above = rule.above_C !== undefined;
  const threshold = (rule.above_C ?? rule.below_C)!;
  const strictThreshold = r2(above ? threshold - u_K : threshold + u_K);
  const word = above ? "above" : "below";
  const extremeWord = above ? "peak" : "lowest";
  const note = u_K > 0 ? `${strictThreshold} °C is rule ${rule.id}'s ${threshold} °C threshold ${above ? "less" : "plus"} the ${u_K} K guard band` : null;
  const peakLimit = rule.max_peak_C ?? (rule.max_cumulative_min === undefined && rule.max_continuous_min === undefined ? threshold : undefined);
  const peak = (): GoverningCurve => ({
    rule_id: rule.id,
    quantity: "extreme_C",
    label: `${extremeWord} ${rule.channel} temperature, °C`,
    note: u_K > 0 ? `a pass needs the ${extremeWord} ${u_K} K inside the limit (the guard band)` : null,
    limit: { value: peakLimit!, label: `${rule.id}: ${extremeWord} ${above ? "≤" : "≥"} ${peakLimit} °C` },
    pass: u_K > 0 ? { value: r2(above ? peakLimit! - u_K : peakLimit! + u_K), label: `pass: ${above ? "≤" : "≥"} ${r2(above ? peakLimit! - u_K : peakLimit! + u_K)} °C (guard band)` } : null,
  });
  const cumulative = (): GoverningCurve => ({
    rule_id: rule.id,
    quantity: "cumulative_min",
    label: `time of the ${rule.channel} ${word} ${strictThreshold} °C, min`,
    note,
    limit: { value: rule.max_cumulative_min!, label: `${rule.id}: ≤ ${rule.max_cumulative_min} min in all` },
    pass: null,
  });
  const continuous = (): GoverningCurve => ({
    rule_id: rule.id,
    quantity: "longest_min",
    label: `longest time of the ${rule.channel} ${word} ${strictThreshold} °C, min`,
    note,
    limit: { value: rule.max_continuous_min!, label: `${rule.id}: ≤ ${rule.max_continuous_min} min at a stretch` },
    pass: null,
  });
  const peakExceeded = peakLimit !== undefined && (above ? at.extreme_C + u_K > peakLimit : at.extreme_C - u_K < peakLimit);
  if (peakExceeded) return peak();
  if (rule.max_cumulative_min !== undefined && at.cumulative_min > rule.max_cumulative_min) return cumulative();
  if (rule.max_continuous_min !== undefined && at.longest_min > rule.max_continuous_min) return continuous();
  return peakLimit !== undefined ? peak() : rule.max_cumulative_min !== undefined ? cumulative() : continuous();
}
