import type { TraceSeries } from "../trace/series";
import type { ModelChoice, Pack, Product } from "../thermal/definitions";
import type { LimitSet } from "../exposure/limits";
import { runReview } from "../review/runReview";
import { describeVariable, largerIsBetter, precisionOf, withValue, type DesignVariable } from "./vary";

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

export interface SizingResult {
  variable: string;
  /** the boundary value: the smallest feasible thickness or coolant mass, or the warmest feasible initial temperature */
  value: number | null;
  feasible: boolean;
  /** peak predicted core temperature at the value, °C (lowest, for a limit set of "below" rules only) */
  metric_at_value: number | null;
  metric: string;
  curve: Array<{ x: number; metric: number; feasible: boolean }>;
  core_at_value: Float64Array | null;
  precision: number;
  reason: string;
  runs: number;
}

/**
 * Finds the boundary of the feasible range of one design variable: the metric curve brackets it, then
 * bisection narrows it to the stated precision. This relies on feasibility being monotone in the
 * variable (more insulation or coolant never warms the product's peak; a colder start never does
 * either). Some rules are not monotone (a longest-continuous-time rule can pass with a thin wall and
 * fail with a thicker one); the curve reveals that, and the result says so. Reports when no value in
 * [min, max] is feasible.
 */
export function size(input: SizingInput): SizingResult {
  const { series, limits, variable, min, max } = input;
  if (!(max > min)) throw new RangeError("max must be greater than min");
  const below = limits.rules.every((r) => r.below_C !== undefined);
  const metricName = below ? "lowest core temperature, °C" : "peak core temperature, °C";
  const precision = precisionOf(variable);
  let runs = 0;
  const evaluate = (x: number) => {
    runs++;
    const d = withValue(input.product, input.pack, variable, x);
    const comp = runReview({ series, product: d.product, pack: d.pack, limits, options: { model: input.model ?? "auto" } });
    let m = below ? Infinity : -Infinity;
    for (const v of comp.core_C) m = below ? Math.min(m, v) : Math.max(m, v);
    return { feasible: comp.result.rules.every((r) => r.status === "pass"), metric: m, core: comp.core_C };
  };
  const points = input.curvePoints ?? 21;
  const curve: SizingResult["curve"] = [];
  for (let i = 0; i < points; i++) {
    const x = min + ((max - min) * i) / (points - 1);
    const e = evaluate(x);
    curve.push({ x, metric: e.metric, feasible: e.feasible });
    input.onProgress?.((i + 1) / (points + 20));
  }
  const up = largerIsBetter(variable);
  const name = describeVariable(variable);
  const warnings: string[] = [];
  const result = (value: number | null, e: ReturnType<typeof evaluate> | null, reason: string): SizingResult => ({
    variable: name, value, feasible: value !== null, metric_at_value: e ? e.metric : null, metric: metricName, curve, core_at_value: e ? e.core : null, precision, reason: [reason, ...warnings].join("; "), runs,
  });
  // Order the curve from the worst end to the best; the feasible region must be a tail of it.
  const ordered = up ? curve : [...curve].reverse();
  let k = ordered.length;
  while (k > 0 && ordered[k - 1]!.feasible) k--;
  if (k === ordered.length) return result(null, null, `no value of ${name} between ${min} and ${max} passes every rule`);
  const strays = ordered.slice(0, k).filter((c) => c.feasible);
  if (strays.length > 0) {
    // e.g. a "longest continuous time" rule: a thin wall gives short, hot excursions that pass
    warnings.push(`feasibility is not monotone in ${name} here: ${strays.map((c) => Number(c.x.toPrecision(4))).join(", ")} also pass; the value given is where passing holds for every ${up ? "larger" : "smaller"} value on the curve`);
  }
  if (k === 0) {
    const e = evaluate(ordered[0]!.x);
    return result(ordered[0]!.x, e, `every value in the range passes; ${ordered[0]!.x} is the ${up ? "smallest" : "largest"}`);
  }
  // feasible at ordered[k], not at ordered[k − 1]: bisect between them to within the precision
  let f = ordered[k]!.x, g = ordered[k - 1]!.x;
  let fe = evaluate(f);
  while (Math.abs(f - g) > precision) {
    const mid = (f + g) / 2;
    const e = evaluate(mid);
    if (e.feasible) {
      f = mid;
      fe = e;
    } else g = mid;
    input.onProgress?.(Math.min(0.99, runs / (points + 20)));
  }
  input.onProgress?.(1);
  return result(f, fe, `${up ? "smallest" : "largest"} feasible value, to within ${precision}`);
}
