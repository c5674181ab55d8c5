import type { TraceSeries } from "../trace/series";
import type { ModelChoice, Pack, Product } from "../thermal/definitions";
import { isThresholdRule, ruleChannel, type LimitSet } from "../exposure/limits";
import type { RuleStatus } from "../exposure/rules";
import { timeBeyond } from "../exposure/timeAbove";
import { runReview } from "../review/runReview";
import { governingCurve, type GoverningCurve } from "./governing";
import { independentRules, type RuleNote } from "./ruleNotes";

export type { RuleNote } from "./ruleNotes";
import { describeVariable, displayOf, formatVariable, largerIsBetter, precisionOf, withValue, type DesignVariable, type VariableDisplay } from "./vary";

export interface SizingInput {
  series: TraceSeries;
  product: Product;
  pack?: Pack;
  limits: LimitSet;
  variable: DesignVariable;
  min: number;
  max: number;
  model?: ModelChoice;
  /** points on the metric curve, evenly spaced from min to max */
  curvePoints?: number;
  onProgress?: (fraction: number) => void;
}

/** One rule at one value of the variable: its status and the measures its allowances are checked on. */
export interface RuleMeasure {
  status: RuleStatus;
  /** highest value of the rule's channel ("above" rules; lowest for "below"), as measured, °C */
  extreme_C: number;
  /** time beyond the threshold moved by the guard band against the shipment: what a pass must keep within the allowance, min */
  cumulative_min: number;
  longest_min: number;
  /** growth and shelf-life rules: the estimate at T + u (what a pass must keep within the limit); NaN for threshold rules */
  consequence?: number;
}

export interface CurvePoint {
  x: number;
  metric: number;
  feasible: boolean;
  /** ids of the rules that do not pass here */
  failing: string[];
  rules: Record<string, RuleMeasure>;
}

export interface SizingResult {
  /** the variable's key, e.g. "layer:1:thickness_m" */
  variable: string;
  /** the variable in the user's words and units */
  display: VariableDisplay;
  /** the boundary value (SI, on the grid of the search precision, on the safe side): the smallest feasible thickness or coolant mass, or the warmest feasible initial temperature */
  value: number | null;
  feasible: boolean;
  /** peak predicted core temperature at the value, °C (lowest, for a limit set of "below" rules only) */
  metric_at_value: number | null;
  metric: string;
  curve: CurvePoint[];
  core_at_value: Float64Array | null;
  precision: number;
  reason: string;
  /** rules that no value in the range brings to a pass, each with advice (found from both ends of the range, before the search) */
  rule_notes: RuleNote[];
  /** the rules that set the boundary (those that fail just short of it) or, with no feasible value, those that fail at the best end */
  governing: Array<{ id: string; status: RuleStatus; reason: string }>;
  /** what to plot against the variable for the first governing rule, with its limit line; null when every value passes */
  chart: GoverningCurve | null;
  /** the most favourable end of the range (the largest thickness or coolant mass, the coldest start) */
  best_x: number;
  /**
   * the range the result calls feasible, SI, lowest first: from the boundary value to the best end (for a colder
   * start, from the coldest start to the value); what a chart shades, rather than the coarse curve's first
   * passing point (21 points over 1–150 mm are 7.45 mm apart). Null when no value passes.
   */
  feasible_range: [number, number] | null;
  /** the curve's measures at the value found (not one of the curve's evenly spaced points): a chart draws its line through it */
  point_at_value: CurvePoint | null;
  runs: number;
  /** the guard band the rules were judged with (the limit set's sensor accuracy), K */
  guard_K: number;
}

interface Evaluation {
  feasible: boolean;
  metric: number;
  core: Float64Array;
  rules: Record<string, RuleMeasure>;
  reasons: Record<string, string>;
}

/**
 * Finds the boundary of the feasible range of one design variable: the metric curve brackets it, then
 * bisection narrows it to the stated precision. This relies on feasibility being monotone in the
 * variable (more insulation or coolant never warms the product's peak; a colder start never does
 * either). Some rules are not monotone (a longest-continuous-time rule can pass with a thin wall and
 * fail with a thicker one); the curve reveals that, and the result says so. Before the search, rules
 * that no value in the range can bring to a pass (air rules, rules failing at both ends) are named with
 * advice; when no value is feasible, the rules failing at the best end of the range are given.
 */
export function size(input: SizingInput): SizingResult {
  const { series, limits, variable, min, max } = input;
  if (!(max > min)) throw new RangeError("max must be greater than min");
  const thresholdRules = limits.rules.filter(isThresholdRule);
  const below = thresholdRules.length > 0 && thresholdRules.every((r) => r.below_C !== undefined);
  const metricName = below ? "lowest core temperature, °C" : "peak core temperature, °C";
  const precision = precisionOf(variable);
  const display = displayOf(variable, input.pack);
  const fmtX = (x: number) => formatVariable(x, display);
  const u = limits.sensor_accuracy_K ?? 0;
  let runs = 0;
  const evaluate = (x: number): Evaluation => {
    runs++;
    const d = withValue(input.product, input.pack, variable, x);
    const comp = runReview({ series, product: d.product, pack: d.pack, limits, options: { model: input.model ?? "auto" } });
    let m = below ? Infinity : -Infinity;
    for (const v of comp.core_C) m = below ? Math.min(m, v) : Math.max(m, v);
    const channel: Record<string, Float64Array> = { air: comp.airBridged_C, core: comp.core_C, surface: comp.surface_C, mean: comp.mean_C };
    const rules: Record<string, RuleMeasure> = {};
    const reasons: Record<string, string> = {};
    for (const c of comp.result.consequence_rules ?? []) {
      rules[c.id] = { status: c.status, extreme_C: NaN, cumulative_min: NaN, longest_min: NaN, consequence: c.upper };
      reasons[c.id] = c.reason;
    }
    thresholdRules.forEach((rule) => {
      const f = comp.result.rules.find((r) => r.id === rule.id)!;
      const values = channel[rule.channel];
      // the pass test's threshold: moved by the guard band against the shipment (lib/exposure/rules.ts)
      const strict = values ? timeBeyond(series.t_s, values, f.threshold_C + (f.direction === "above" ? -u : u), f.direction) : null;
      rules[rule.id] = { status: f.status, extreme_C: f.extreme_C, cumulative_min: strict ? strict.cumulative_s / 60 : NaN, longest_min: strict ? strict.longest_s / 60 : NaN, consequence: NaN };
      reasons[rule.id] = f.reason;
    });
    return { feasible: Object.values(rules).every((r) => r.status === "pass"), metric: m, core: comp.core_C, rules, reasons };
  };
  const failingOf = (e: Evaluation) => Object.entries(e.rules).filter(([, r]) => r.status !== "pass").map(([id, r]) => ({ id, status: r.status, reason: e.reasons[id]! }));

  const points = input.curvePoints ?? 21;
  const curve: CurvePoint[] = [];
  const evals: Evaluation[] = [];
  for (let i = 0; i < points; i++) {
    // 12 significant digits: the curve's x values read 0.05315, not 0.053149999999999996
    const x = i === points - 1 ? max : Number((min + ((max - min) * i) / (points - 1)).toPrecision(12));
    const e = evaluate(x);
    evals.push(e);
    curve.push({ x, metric: e.metric, feasible: e.feasible, failing: failingOf(e).map((f) => f.id), rules: e.rules });
    input.onProgress?.((i + 1) / (points + 20));
  }
  const up = largerIsBetter(variable);
  const best = up ? evals[evals.length - 1]! : evals[0]!;
  const worst = up ? evals[0]! : evals[evals.length - 1]!;
  const best_x = up ? max : min;

  // Before the search: rules the variable cannot bring to a pass in this range.
  const notes = independentRules(limits, variable, input.pack).map((n) =>
    best.rules[n.id]!.status !== "pass" ? { ...n, advice: `${n.advice}. It does not pass on this ambient: ${best.reasons[n.id]}` } : n,
  );
  for (const r of limits.rules) {
    if (ruleChannel(r) === "air" || best.rules[r.id]!.status === "pass" || worst.rules[r.id]!.status === "pass") continue;
    notes.push({
      id: r.id,
      channel: ruleChannel(r),
      kind: "fails-throughout",
      advice: `rule ${r.id} does not pass at either end of the range (${fmtX(min)} and ${fmtX(max)}): widen the range, or change the rule or the ambient. At ${fmtX(best_x)}: ${best.reasons[r.id]}`,
    });
  }

  const warnings: string[] = [];
  const result = (value: number | null, e: Evaluation | null, governing: SizingResult["governing"], reason: string, at?: Evaluation): SizingResult => {
    const rule = governing[0] ? limits.rules.find((r) => r.id === governing[0]!.id) : undefined;
    return {
      variable: describeVariable(variable), display, value, feasible: value !== null, metric_at_value: e ? e.metric : null, metric: metricName, curve,
      core_at_value: e ? e.core : null, precision, reason: [reason, ...warnings].join("; "), rule_notes: notes, governing,
      chart: rule && at ? governingCurve(rule, u, at.rules[rule.id]!) : null, best_x, runs, guard_K: u,
      feasible_range: value === null ? null : up ? [value, max] : [min, value],
      point_at_value: value !== null && e ? { x: value, metric: e.metric, feasible: e.feasible, failing: failingOf(e).map((f) => f.id), rules: e.rules } : null,
    };
  };
  const ruleList = (g: SizingResult["governing"]) => g.map((f) => (f.status === "fail" ? `rule ${f.id} ${f.reason}` : `rule ${f.id} is inconclusive, ${f.reason}`)).join("; ");

  // Order the curve from the worst end to the best; the feasible region must be a tail of it.
  const ordered = up ? curve : [...curve].reverse();
  const orderedEvals = up ? evals : [...evals].reverse();
  let k = ordered.length;
  while (k > 0 && ordered[k - 1]!.feasible) k--;
  if (k === ordered.length) {
    const governing = failingOf(best);
    return result(null, null, governing, `no ${display.name} between ${fmtX(min)} and ${fmtX(max)} passes every rule. At ${fmtX(best_x)}, the best end of the range, ${ruleList(governing)}`, best);
  }
  const strays = ordered.slice(0, k).filter((c) => c.feasible);
  if (strays.length > 0) {
    // e.g. a "longest continuous time" rule: a thin wall gives short, hot excursions that pass
    warnings.push(`feasibility is not monotone in ${display.name} here: ${strays.map((c) => fmtX(c.x)).join(", ")} also pass; the value given is where passing holds for every ${up ? "larger" : "smaller"} value on the curve`);
  }
  if (k === 0) {
    const x = ordered[0]!.x;
    return result(x, orderedEvals[0]!, [], `every value in the range passes; ${fmtX(x)} is the ${up ? "smallest" : "largest"}`);
  }
  // Feasible at ordered[k], not at ordered[k − 1]. Bisect on the grid of the search precision: the
  // answer is the grid value nearest the boundary on the safe side, so it is reported without binary
  // noise (0.0337 m, not 0.033651953124999995 m) and lies within one step of the true boundary.
  const p = precision;
  const onGrid = (n: number) => Number((n * p).toFixed(Math.max(0, Math.round(-Math.log10(p)))));
  let a = up ? Math.ceil(ordered[k]!.x / p - 1e-9) : Math.floor(ordered[k]!.x / p + 1e-9); // feasible side
  let b = up ? Math.floor(ordered[k - 1]!.x / p + 1e-9) : Math.ceil(ordered[k - 1]!.x / p - 1e-9); // infeasible side
  let fe = orderedEvals[k]!, ge = orderedEvals[k - 1]!;
  let value = ordered[k]!.x;
  const first = Math.min(max, Math.max(min, onGrid(a)));
  if (first !== value) {
    const e = evaluate(first);
    if (e.feasible) {
      fe = e;
      value = first;
    } else warnings.push(`${fmtX(first)} does not pass although ${fmtX(value)} does; the search works on the curve's points only`);
  }
  if (value === first) {
    while (Math.abs(a - b) > 1) {
      const mid = Math.floor((a + b) / 2);
      const e = evaluate(onGrid(mid));
      if (e.feasible) {
        a = mid;
        fe = e;
        value = onGrid(mid);
      } else {
        b = mid;
        ge = e;
      }
      input.onProgress?.(Math.min(0.99, runs / (points + 20)));
    }
  }
  input.onProgress?.(1);
  const governing = failingOf(ge);
  const precisionText = `${(precision * display.factor).toFixed(display.decimals === 0 ? 0 : display.decimals)} ${display.unit}`;
  return result(value, fe, governing, `${up ? "smallest" : "largest"} feasible ${display.name}, to within ${precisionText}; set by ${governing.map((x) => `rule ${x.id}`).join(", ")}, which ${governing.length === 1 ? "does" : "do"} not pass just ${up ? "below" : "above"} it`, ge);
}
