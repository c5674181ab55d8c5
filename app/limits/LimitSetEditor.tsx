"use client";

import { ActionForm } from "@/app/components/ActionForm";
import { useActionState, useState } from "react";
import { saveLimitSet } from "@/app/actions/definitions";
import { DefinitionFooter } from "@/app/components/DefinitionFooter";
import { CHANNELS, type LimitSet } from "@/lib/exposure/limits";
import type { LimitTemplate } from "@/lib/exposure/templates";
import type { FormState } from "@/lib/validation";

interface RuleRow {
  id: string;
  /** threshold (time beyond), growth (log10 increase of a product model), shelf_life (percent consumed) */
  kind: "threshold" | "growth" | "shelf_life";
  /** growth and shelf-life rules: the model id on the product, the largest value allowed */
  model: string;
  maxConsequence: string;
  channel: string;
  direction: "above" | "below";
  threshold: string;
  cumulative: string;
  continuous: string;
  peak: string;
}

const emptyRule = (n: number): RuleRow => ({ id: `rule-${n}`, kind: "threshold", model: "", maxConsequence: "", channel: "core", direction: "above", threshold: "", cumulative: "", continuous: "", peak: "" });
const opt = (s: string) => (s.trim() === "" ? undefined : Number(s));

function rowsFrom(limits: LimitSet): RuleRow[] {
  return limits.rules.map((r): RuleRow => {
    const base = { id: r.id, channel: r.channel ?? "core", model: "", maxConsequence: "", direction: "above" as const, threshold: "", cumulative: "", continuous: "", peak: "" };
    if (r.kind === "growth") return { ...base, kind: "growth", model: r.model, maxConsequence: String(r.max_log10_increase) };
    if (r.kind === "shelf_life") return { ...base, kind: "shelf_life", model: r.model ?? "", maxConsequence: String(r.max_consumed_percent) };
    return {
    ...base,
    kind: "threshold",
    direction: r.above_C !== undefined ? "above" : "below",
    threshold: String(r.above_C ?? r.below_C ?? ""),
    cumulative: r.max_cumulative_min?.toString() ?? "",
    continuous: r.max_continuous_min?.toString() ?? "",
    peak: r.max_peak_C?.toString() ?? "",
    };
  });
}

/** The rule as the schema reads it; a consequence rule on the core leaves the channel out (the default). */
function ruleOf(r: RuleRow): Record<string, unknown> {
  const channel = r.channel === "core" ? undefined : r.channel;
  if (r.kind === "growth") return { id: r.id, kind: "growth", model: r.model, max_log10_increase: opt(r.maxConsequence) ?? Number.NaN, channel };
  if (r.kind === "shelf_life") return { id: r.id, kind: "shelf_life", model: r.model.trim() === "" ? undefined : r.model, max_consumed_percent: opt(r.maxConsequence) ?? Number.NaN, channel };
  return {
    id: r.id,
    channel: r.channel,
    [r.direction === "above" ? "above_C" : "below_C"]: opt(r.threshold) ?? Number.NaN,
    max_cumulative_min: opt(r.cumulative),
    max_continuous_min: opt(r.continuous),
    max_peak_C: opt(r.peak),
  };
}

/** Builds a limit set rule by rule; the server validates the whole set and names the rule and field at fault. */
export function LimitSetEditor({ templates, editing }: { templates: readonly LimitTemplate[]; editing?: { id: string; lineage: string; version: number; body: LimitSet } }) {
  const [state, action, pending] = useActionState<FormState, FormData>(saveLimitSet, {});
  const [name, setName] = useState(editing?.body.name ?? "");
  const [accuracy, setAccuracy] = useState(editing ? (editing.body.sensor_accuracy_K?.toString() ?? "") : "0.5");
  const [rules, setRules] = useState<RuleRow[]>(editing ? rowsFrom(editing.body) : [emptyRule(1)]);
  const [source, setSource] = useState<string | null>(null);

  const definition = {
    name,
    sensor_accuracy_K: opt(accuracy),
    rules: rules.map(ruleOf),
  };
  const set = (i: number, patch: Partial<RuleRow>) => setRules(rules.map((r, j) => (j === i ? { ...r, ...patch } : r)));
  const err = (path: string) => state.fieldErrors?.[path];
  const applyTemplate = (key: string) => {
    const t = templates.find((x) => x.key === key);
    if (!t) return;
    setName(t.limits.name);
    setAccuracy(t.limits.sensor_accuracy_K?.toString() ?? "");
    setRules(rowsFrom(t.limits));
    setSource(t.source);
  };

  return (
    <ActionForm action={action} className="stack" style={{ maxWidth: "none" }} aria-label="Limit set">
      {editing && <p className="muted">Editing version {editing.version}: saving creates version {editing.version + 1}.</p>}
      <label htmlFor="f-template">
        Start from a template
        <select id="f-template" defaultValue="" onChange={(e) => applyTemplate(e.target.value)} data-testid="template-select">
          <option value="">(blank)</option>
          {templates.map((t) => <option key={t.key} value={t.key}>{t.title}</option>)}
        </select>
      </label>
      {source && <p className="caution" data-testid="template-source">Source: {source}</p>}
      <label htmlFor="f-ls-name">
        Name
        <input id="f-ls-name" value={name} onChange={(e) => setName(e.target.value)} aria-invalid={err("name") ? true : undefined} />
        {err("name") && <span className="field-error">{err("name")}</span>}
      </label>
      <label htmlFor="f-accuracy">
        Sensor accuracy (± K)
        <span className="hint">Widens each rule into a guard band: pass only when clear of the limit by this much.</span>
        <input id="f-accuracy" value={accuracy} onChange={(e) => setAccuracy(e.target.value)} inputMode="decimal" />
        {err("sensor_accuracy_K") && <span className="field-error">{err("sensor_accuracy_K")}</span>}
      </label>
      <table>
        <thead>
          <tr><th>Rule id</th><th>Kind</th><th>Channel</th><th>Counts time</th><th>Threshold °C</th><th>Max cumulative min</th><th>Max continuous min</th><th>Max peak °C</th><th /></tr>
        </thead>
        <tbody>
          {rules.map((r, i) => (
            <tr key={i} data-testid={`rule-row-${i}`}>
              <td><input aria-label={`rule ${i + 1} id`} value={r.id} size={14} onChange={(e) => set(i, { id: e.target.value })} /></td>
              <td>
                <select aria-label={`rule ${i + 1} kind`} value={r.kind} onChange={(e) => set(i, { kind: e.target.value as RuleRow["kind"] })}>
                  <option value="threshold">time beyond</option>
                  <option value="growth">growth</option>
                  <option value="shelf_life">shelf life</option>
                </select>
              </td>
              <td>
                <select aria-label={`rule ${i + 1} channel`} value={r.channel} onChange={(e) => set(i, { channel: e.target.value })}>
                  {CHANNELS.map((c) => <option key={c} value={c}>{c}</option>)}
                </select>
              </td>
              {r.kind === "threshold" ? (
                <>
              <td>
                <select aria-label={`rule ${i + 1} direction`} value={r.direction} onChange={(e) => set(i, { direction: e.target.value as RuleRow["direction"] })}>
                  <option value="above">above</option>
                  <option value="below">below</option>
                </select>
              </td>
              <td><input aria-label={`rule ${i + 1} threshold`} value={r.threshold} size={6} inputMode="decimal" onChange={(e) => set(i, { threshold: e.target.value })} /></td>
              <td><input aria-label={`rule ${i + 1} max cumulative minutes`} value={r.cumulative} size={6} inputMode="decimal" onChange={(e) => set(i, { cumulative: e.target.value })} /></td>
              <td><input aria-label={`rule ${i + 1} max continuous minutes`} value={r.continuous} size={6} inputMode="decimal" onChange={(e) => set(i, { continuous: e.target.value })} /></td>
              <td><input aria-label={`rule ${i + 1} max peak`} value={r.peak} size={6} inputMode="decimal" onChange={(e) => set(i, { peak: e.target.value })} /></td>
                </>
              ) : (
                <>
                  <td><span className="hint">model id</span><input aria-label={`rule ${i + 1} model`} value={r.model} size={8} placeholder={r.kind === "growth" ? "e.g. lm" : "(the only one)"} onChange={(e) => set(i, { model: e.target.value })} /></td>
                  <td><span className="hint">{r.kind === "growth" ? "max log10 increase" : "max % consumed"}</span><input aria-label={`rule ${i + 1} ${r.kind === "growth" ? "max log10 increase" : "max percent consumed"}`} value={r.maxConsequence} size={6} inputMode="decimal" onChange={(e) => set(i, { maxConsequence: e.target.value })} /></td>
                  <td colSpan={3} className="muted">{r.kind === "growth" ? "log10 increase of the product's growth model, judged under the guard band" : "percent of the shelf life consumed, judged under the guard band"}</td>
                </>
              )}
              <td><button type="button" className="secondary" onClick={() => setRules(rules.filter((_, j) => j !== i))} disabled={rules.length === 1}>Remove</button></td>
            </tr>
          ))}
        </tbody>
      </table>
      {Object.entries(state.fieldErrors ?? {})
        .filter(([k]) => k.startsWith("rules"))
        .map(([k, m]) => (
          <p key={k} className="field-error" data-testid="rule-error">
            {k.replace(/^rules\.(\d+)/, (_, n: string) => `rule ${Number(n) + 1}`)}: {m}
          </p>
        ))}
      <p className="hint muted">A rule with no maximum allows no time beyond its threshold. Leave a maximum blank to not use it. A growth or shelf-life rule names a model id on the product (Products, "Growth and shelf life") and is judged on the guard band of its estimate: the estimate at the temperatures less and plus the sensor accuracy.</p>
      <button type="button" className="secondary" onClick={() => setRules([...rules, emptyRule(rules.length + 1)])}>Add a rule</button>
      <DefinitionFooter definition={definition} editing={editing} state={state} pending={pending} noun="limit set" />
    </ActionForm>
  );
}
