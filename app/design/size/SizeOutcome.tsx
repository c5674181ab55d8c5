"use client";

import type { LimitSet } from "@/lib/exposure/limits";
import type { SizingResult } from "@/lib/design/sizing";
import { formatVariable } from "@/lib/design/vary";
import { formatC } from "@/lib/display/numbers";
import { CurveChart, type CurveLimit } from "@/app/components/CurveChart";
import { TemperatureChart } from "@/app/components/TemperatureChart";
import { limitLines } from "./limitLines";

type SizeResult = Omit<SizingResult, "core_at_value"> & { core_at_value: number[] | null };

/** A sizing result in the user's words: the value or why there is none, the governing rule's curve with its limit, and the core there. */
export function SizeOutcome({ result, t_s, air_C, limits }: { result: SizeResult; t_s: number[]; air_C: number[]; limits: LimitSet }) {
  const d = result.display;
  const up = result.variable !== "product:initial_C";
  const headline = result.feasible
    ? `${up ? "Smallest" : "Warmest"} ${d.name} that passes every rule: ${formatVariable(result.value!, d)}`
    : `No ${d.name} in this range passes every rule`;
  const chart = result.chart;
  // the evenly spaced curve and the value found: without it the line runs straight past the boundary (21 points over
  // 1–150 mm are 7.45 mm apart) and reads far above the limit at a value the result says passes
  const curve = result.point_at_value ? [...result.curve.filter((c) => c.x !== result.point_at_value!.x), result.point_at_value].sort((a, b) => a.x - b.x) : result.curve;
  const points = curve.map((c) => ({ x: c.x * d.factor, y: chart ? (c.rules[chart.rule_id]![chart.quantity] ?? NaN) : c.metric, feasible: c.feasible, failing: c.failing }));
  const lines: CurveLimit[] = chart ? [{ ...chart.limit, kind: "limit" as const }, ...(chart.pass ? [{ ...chart.pass, kind: "pass" as const }] : [])] : [];
  const metricWords = result.metric.replace(/, °C$/, "");
  return (
    <div data-testid="size-result" style={{ marginTop: "0.8rem" }}>
      <p><strong data-testid="size-headline">{headline}</strong></p>
      <p data-testid="size-reason">{result.reason[0]!.toUpperCase() + result.reason.slice(1)}.{result.metric_at_value !== null ? ` The ${metricWords} there is ${formatC(result.metric_at_value)}.` : ""}</p>
      {result.rule_notes.length > 0 && (
        <>
          <p className="muted" style={{ marginBottom: 0 }}>Rules that no {d.name} in this range can bring to a pass:</p>
          <ul className="warnings" data-testid="rule-notes">{result.rule_notes.map((n) => <li key={n.id}>{n.advice}.</li>)}</ul>
        </>
      )}
      <CurveChart points={points} xLabel={d.label} yLabel={chart ? chart.label : result.metric} chosen={result.value === null ? null : result.value * d.factor} feasible={result.feasible_range ? [result.feasible_range[0] * d.factor, result.feasible_range[1] * d.factor] : null} limits={lines} note={chart?.note} />
      {result.core_at_value && (
        <TemperatureChart title="Air and predicted core at the boundary value" height={240} times_ms={t_s.map((t) => t * 1000)}
          lines={[{ label: "Air (profile)", color: "var(--air)", values: air_C }, { label: `Core at ${formatVariable(result.value!, d)}`, color: "var(--core)", values: result.core_at_value }]}
          thresholds={limitLines(limits, ["core", "surface", "mean"])} />
      )}
    </div>
  );
}
