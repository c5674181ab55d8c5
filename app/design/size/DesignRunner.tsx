"use client";

import { useEffect, useRef, useState } from "react";
import type { Pack, Product } from "@/lib/thermal/definitions";
import type { LimitSet } from "@/lib/exposure/limits";
import { designValueText, displayOf, parseVariable, valueOf, type DesignVariable, type VariableDisplay } from "@/lib/design/vary";
import type { SizingResult } from "@/lib/design/sizing";
import { independentRules, type RuleNote } from "@/lib/design/ruleNotes";
import { SizeOutcome } from "./SizeOutcome";
import { limitLines } from "./limitLines";
import { inputLabel } from "./inputLabel";
import { fixed } from "@/lib/display/numbers";
import { num } from "@/app/components/NumberField";
import { TemperatureChart } from "@/app/components/TemperatureChart";
import { mayConduct, overCapMessage, studyCostSteps } from "@/lib/uncertainty/cost";

interface Props { t_s: number[]; air_C: number[]; product: Product; pack?: Pack; limits: LimitSet }
type Run = { kind: "idle" } | { kind: "running"; what: string; fraction: number; started: number } | { kind: "error"; message: string };
type SizeResult = Omit<SizingResult, "core_at_value"> & { core_at_value: number[] | null };
interface McResult { samples: number; seed: number; p05: number[]; p50: number[]; p95: number[]; deterministic: number[]; half_width_K: number; fail_fraction: Record<string, number>; redraws: number; /** the design value it ran at, in words ("EPS wall thickness 33.8 mm, the boundary found above") */ at: string; /** whether that was the boundary sizing found */ atBoundary: boolean }
interface InputRow { path: string; plusminus: string; percent: boolean; distribution: "normal" | "uniform" }

/** The numeric fields of the product and pack that can carry an uncertainty, as paths. */
function numericPaths(product: Product, pack?: Pack): string[] {
  const out: string[] = [];
  const walk = (o: unknown, prefix: string) => {
    if (typeof o === "number") out.push(prefix);
    else if (Array.isArray(o)) o.forEach((v, i) => walk(v, `${prefix}.${i}`));
    else if (o && typeof o === "object") for (const [k, v] of Object.entries(o)) if (k !== "provenance") walk(v, `${prefix}.${k}`);
  };
  walk(product, "product");
  if (pack) walk(pack, "pack");
  return out;
}

export function DesignRunner({ t_s, air_C, product, pack, limits }: Props) {
  // The range is entered in the variable's display unit (mm, g, °C) and converted to SI once, here.
  const variable = (key: string, v: DesignVariable, min: number, max: number) => ({ key, v, d: displayOf(v, pack), min, max });
  const variables: Array<{ key: string; v: DesignVariable; d: VariableDisplay; min: number; max: number }> = [
    ...(pack?.layers ?? []).map((_, i) => variable(`layer:${i + 1}:thickness_m`, { kind: "layer", index: i, field: "thickness_m" }, 1, 150)),
    ...(pack?.coolants ?? []).map((_, i) => variable(`coolant:${i + 1}:mass_kg`, { kind: "coolant", index: i, field: "mass_kg" }, 0, 5000)),
    variable("product:initial_C", { kind: "product", field: "initial_C" }, -10, 10),
  ];
  const [varKey, setVarKey] = useState(variables[0]!.key);
  const chosen = variables.find((v) => v.key === varKey)!;
  const [min, setMin] = useState(String(chosen.min));
  const [max, setMax] = useState(String(chosen.max));
  const [rangeErrors, setRangeErrors] = useState<{ min?: string; max?: string }>({});
  // Known before any run: rules on the air, which no value of the variable changes.
  const notesBefore: RuleNote[] = independentRules(limits, chosen.v, pack);
  const [run, setRun] = useState<Run>({ kind: "idle" });
  const [sizeResult, setSizeResult] = useState<SizeResult | null>(null);
  const [mc, setMc] = useState<McResult | null>(null);
  const paths = numericPaths(product, pack);
  const [inputs, setInputs] = useState<InputRow[]>([{ path: (paths.find((p) => /^pack\.layers\.\d+\.k_W_mK$/.test(p)) ?? paths.find((p) => /k_W_mK|h_outside/.test(p))) ?? paths[0]!, plusminus: "10", percent: true, distribution: "normal" }]);
  // The design value a Monte Carlo study runs at: the boundary sizing found (when it found one), or the definitions as stored.
  const [mcAt, setMcAt] = useState<"boundary" | "defined">("boundary");
  const boundaryVariable = sizeResult?.value != null ? parseVariable(sizeResult.variable) : null;
  const boundary = boundaryVariable && sizeResult?.value != null ? { variable: boundaryVariable, value: sizeResult.value, text: `${designValueText(sizeResult.value, sizeResult.display)}, the boundary found above` } : null;
  const definedText = `${designValueText(valueOf(product, pack, chosen.v), chosen.d)}, as the ${chosen.v.kind === "product" ? "product" : "pack"} defines it`;
  const runAt = mcAt === "boundary" && boundary ? boundary : null;
  const [samples, setSamples] = useState("500");
  const [seed, setSeed] = useState("1");
  const worker = useRef<Worker | null>(null);
  useEffect(() => () => worker.current?.terminate(), []);

  const start = (what: string, job: object, onDone: (r: unknown) => void) => {
    worker.current?.terminate();
    const w = new Worker(new URL("./designWorker.ts", import.meta.url));
    worker.current = w;
    const started = Date.now();
    setRun({ kind: "running", what, fraction: 0, started });
    w.onmessage = (e: MessageEvent) => {
      const m = e.data as { type: "progress"; fraction: number } | { type: "done"; result: unknown } | { type: "error"; message: string };
      if (m.type === "progress") setRun({ kind: "running", what, fraction: m.fraction, started });
      else if (m.type === "done") {
        onDone(m.result);
        setRun({ kind: "idle" });
        w.terminate();
      } else setRun({ kind: "error", message: m.message });
    };
    w.postMessage({ ...job, t_s, air_C, product, pack, limits, model: "auto" });
  };
  const cancel = () => {
    worker.current?.terminate();
    worker.current = null;
    setRun({ kind: "error", message: "cancelled" });
  };
  const runSize = () => {
    const lo = num(min), hi = num(max);
    const unit = chosen.d.unit;
    const errors: { min?: string; max?: string } = {};
    if (lo === undefined || !Number.isFinite(lo)) errors.min = `from: '${min}' is not a number of ${unit}`;
    if (hi === undefined || !Number.isFinite(hi)) errors.max = `to: '${max}' is not a number of ${unit}`;
    else if (lo !== undefined && Number.isFinite(lo) && !(hi > lo)) errors.max = `to: must be greater than from (${lo} ${unit})`;
    if (chosen.v.kind !== "product" && lo !== undefined && lo < 0) errors.min = `from: a ${chosen.d.name} cannot be negative`;
    setRangeErrors(errors);
    if (errors.min || errors.max) return setRun({ kind: "error", message: [errors.min, errors.max].filter(Boolean).join("; ") });
    start("Sizing", { type: "size", variable: chosen.v, min: lo! / chosen.d.factor, max: hi! / chosen.d.factor }, (r) => setSizeResult(r as SizeResult));
  };
  const runMc = () => {
    const n = num(samples), s = num(seed);
    if (n === undefined || !(n >= 10 && n <= 20000) || s === undefined || !Number.isInteger(s)) return setRun({ kind: "error", message: "samples must be 10 to 20,000 and the seed a whole number" });
    const spec = { inputs: inputs.map((r) => ({ path: r.path, plusminus: num(r.plusminus) ?? 0, percent: r.percent, distribution: r.distribution })), samples: n, seed: s, use_in_guard_band: false };
    // the same cap as a review on the server: the tab would otherwise be busy for hours
    const conduction = mayConduct("auto", product);
    const refusal = overCapMessage(studyCostSteps(t_s.length, n, conduction), conduction, "this page runs");
    if (refusal) return setRun({ kind: "error", message: refusal });
    const at = runAt ? runAt.text : definedText;
    start("Monte Carlo", { type: "mc", spec, ...(runAt ? { at: { variable: runAt.variable, value: runAt.value } } : {}) }, (r) => setMc({ ...(r as Omit<McResult, "at" | "atBoundary">), at, atBoundary: runAt !== null }));
  };
  const busy = run.kind === "running";
  // set once React has attached the handlers: a click before that does nothing (tests wait for it)
  const [hydrated, setHydrated] = useState(false);
  useEffect(() => setHydrated(true), []);

  return (
    <>
      <section className="card" data-testid="design-runner" data-hydrated={hydrated ? "true" : "false"}>
        <h2 style={{ marginTop: 0 }}>Size one design variable</h2>
        <div style={{ display: "flex", flexWrap: "wrap", gap: "0.8rem", alignItems: "end" }}>
          <label>Variable
            <select value={varKey} onChange={(e) => { const v = variables.find((x) => x.key === e.target.value)!; setVarKey(v.key); setMin(String(v.min)); setMax(String(v.max)); setRangeErrors({}); }} data-testid="size-variable">
              {variables.map((v) => <option key={v.key} value={v.key}>{v.d.label}</option>)}
            </select>
          </label>
          <label>from ({chosen.d.unit})<input value={min} onChange={(e) => setMin(e.target.value)} size={7} data-testid="size-min" aria-invalid={rangeErrors.min ? true : undefined} /></label>
          <label>to ({chosen.d.unit})<input value={max} onChange={(e) => setMax(e.target.value)} size={7} data-testid="size-max" aria-invalid={rangeErrors.max ? true : undefined} /></label>
          <button type="button" onClick={runSize} disabled={busy}>Find the boundary</button>
        </div>
        {(rangeErrors.min || rangeErrors.max) && <p className="field-error" data-testid="size-range-error">{[rangeErrors.min, rangeErrors.max].filter(Boolean).join("; ")}</p>}
        {notesBefore.length > 0 && !sizeResult && (
          <ul className="warnings" data-testid="rule-notes-before">{notesBefore.map((n) => <li key={n.id}>{n.advice}.</li>)}</ul>
        )}
        {sizeResult && <SizeOutcome result={sizeResult} t_s={t_s} air_C={air_C} limits={limits} />}
      </section>

      <section className="card">
        <h2 style={{ marginTop: 0 }}>Prediction uncertainty (Monte Carlo)</h2>
        <p className="muted">Each uncertain input is ± a half-width (uniform) or one standard deviation (normal), absolute or in percent. The generator is seeded: the same seed gives the same band.</p>
        <table>
          <thead><tr><th>Input</th><th>±</th><th>%</th><th>Distribution</th><th /></tr></thead>
          <tbody>
            {inputs.map((r, i) => (
              <tr key={i}>
                <td><select aria-label={`uncertain input ${i + 1}`} value={r.path} onChange={(e) => setInputs(inputs.map((x, j) => (j === i ? { ...x, path: e.target.value } : x)))}>{paths.map((p) => <option key={p} value={p}>{inputLabel(p, product, pack)}</option>)}</select></td>
                <td><input aria-label={`uncertainty ${i + 1}`} value={r.plusminus} size={6} onChange={(e) => setInputs(inputs.map((x, j) => (j === i ? { ...x, plusminus: e.target.value } : x)))} /></td>
                <td><input type="checkbox" aria-label={`in percent ${i + 1}`} checked={r.percent} onChange={(e) => setInputs(inputs.map((x, j) => (j === i ? { ...x, percent: e.target.checked } : x)))} /></td>
                <td><select value={r.distribution} onChange={(e) => setInputs(inputs.map((x, j) => (j === i ? { ...x, distribution: e.target.value as InputRow["distribution"] } : x)))}><option value="normal">normal</option><option value="uniform">uniform</option></select></td>
                <td><button type="button" className="secondary" onClick={() => setInputs(inputs.filter((_, j) => j !== i))} disabled={inputs.length === 1}>Remove</button></td>
              </tr>
            ))}
          </tbody>
        </table>
        <div style={{ display: "flex", flexWrap: "wrap", gap: "0.8rem", alignItems: "end", marginTop: "0.6rem" }}>
          <button type="button" className="secondary" onClick={() => setInputs([...inputs, { path: paths[0]!, plusminus: "5", percent: true, distribution: "normal" }])}>Add an input</button>
          <label>Run at
            <select value={runAt ? "boundary" : "defined"} onChange={(e) => setMcAt(e.target.value as "boundary" | "defined")} data-testid="mc-at">
              {boundary && <option value="boundary">{boundary.text}</option>}
              <option value="defined">{definedText}</option>
            </select>
          </label>
          <label>Samples<input value={samples} onChange={(e) => setSamples(e.target.value)} size={6} data-testid="mc-samples" /></label>
          <label>Seed<input value={seed} onChange={(e) => setSeed(e.target.value)} size={6} /></label>
          <button type="button" onClick={runMc} disabled={busy}>Run</button>
        </div>
        {mc && (
          <div data-testid="mc-result" style={{ marginTop: "0.8rem" }}>
            <p data-testid="mc-design-value">Run at {mc.at}.</p>
            <p>{mc.samples} samples (seed {mc.seed}); the 5–95 % band of the core is at most ±{fixed(mc.half_width_K, 2)} K wide{mc.redraws ? `; ${mc.redraws} non-physical draws were repeated` : ""}.</p>
            <ul>{Object.entries(mc.fail_fraction).map(([id, f]) => <li key={id}>rule {id} fails in {(f * 100).toFixed(1)} % of samples</li>)}</ul>
            {mc.atBoundary && Object.values(mc.fail_fraction).some((f) => f > 0) && (
              <p className="caution" data-testid="mc-margin">
                The boundary passes only with every input at its nominal value: with these uncertainties {Object.entries(mc.fail_fraction).filter(([, f]) => f > 0).map(([id, f]) => `rule ${id} fails in ${(f * 100).toFixed(1)} %`).join(", ")} of samples. Add margin (size again with the inputs at their unfavourable ends, or choose a larger value and run this study there) and confirm the pack with a physical test before relying on it.
              </p>
            )}
            <TemperatureChart title="Core temperature band" height={260} times_ms={t_s.map((t) => t * 1000)}
              bands={[{ label: "Core 5–95 % band", color: "#23577a", lower: mc.p05, upper: mc.p95 }]}
              lines={[{ label: "Air", color: "var(--air)", values: air_C }, { label: "Core, nominal inputs", color: "var(--core)", values: mc.deterministic }]}
              thresholds={limitLines(limits, ["core"])} />
          </div>
        )}
      </section>

      {run.kind === "running" && (
        <div className="card" data-testid="design-progress" style={{ position: "sticky", bottom: 0 }}>
          <progress max={1} value={run.fraction} style={{ width: "70%" }} /> {run.what}: {Math.round(run.fraction * 100)} %
          {" "}<button type="button" className="secondary" onClick={cancel} data-testid="cancel">Cancel</button>
        </div>
      )}
      {run.kind === "error" && <p className="form-error" data-testid="design-error">{run.message}</p>}
    </>
  );
}
