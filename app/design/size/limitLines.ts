import { isThresholdRule, type LimitSet } from "@/lib/exposure/limits";
import type { ChartThreshold } from "@/app/components/TemperatureChart";

/** The limit set's thresholds on the given channels as chart lines, each labelled with the rules it belongs to. */
export function limitLines(limits: LimitSet, channels: readonly string[]): ChartThreshold[] {
  const byValue = new Map<number, string[]>();
  for (const r of limits.rules) {
    if (!isThresholdRule(r) || !channels.includes(r.channel)) continue;
    const v = (r.above_C ?? r.below_C)!;
    byValue.set(v, [...(byValue.get(v) ?? []), r.id]);
  }
  // the rule ids only: the value is on the axis, and the chart's label margin is narrow
  return [...byValue].map(([value_C, ids]) => ({ value_C, label: ids.join(", ") }));
}
