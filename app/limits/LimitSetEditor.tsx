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
  channel: string;
  direction: "above" | "below";
  threshold: string;
  cumulative: string;
  continuous: string;
  peak: string;
}

const emptyRule = (n: number): RuleRow => ({ id: `rule-${n}`, channel: "core", direction: "above", threshold: "", cumulative: "", continuous: "", peak: "" });
const opt = (s: string) => (s.trim() === "" ? undefined : Number(s));

function rowsFrom(limits: LimitSet): RuleRow[] {
  return limits.rules.map((r) => ({
    id: r.id,
    channel: r.channel,
    direction: r.above_C !== undefined ? "above" : "below",
    threshold: String(r.above_C ?? r.below_C ?? ""),
    cumulative: r.max_cumulative_min?.toString() ?? "",
    continuous: r.max_continuous_min?.toString() ?? "",
    peak: r.max_peak_C?.toString() ?? "",
  }));
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
    rules: rules.map((r) => ({
      id: r.id,
      channel: r.channel,
      [r.direction === "above" ? "above_C" : "below_C"]: opt(r.threshold) ?? Number.NaN,
      max_cumulative_min: opt(r.cumulative),
      max_continuous_min: opt(r.continuous),
      max_peak_C: opt(r.peak),
    })),
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
          <tr><th>Rule id</th><th>Channel</th><th>Counts time</th><th>Threshold °C</th><th>Max cumulative min</th><th>Max continuous min</th><th>Max peak °C</th><th /></tr>
        </thead>
        <tbody>
          {rules.map((r, i) => (
            <tr key={i} data-testid={`rule-row-${i}`}>
              <td><input aria-label={`rule ${i + 1} id`} value={r.id} size={14} onChange={(e) => set(i, { id: e.target.value })} /></td>
              <td>
                <select aria-label={`rule ${i + 1} channel`} value={r.channel} onChange={(e) => set(i, { channel: e.target.value })}>
                  {CHANNELS.map((c) => <option key={c} value={c}>{c}</option>)}
                </select>
              </td>
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
      <p className="hint muted">A rule with no maximum allows no time beyond its threshold. Leave a maximum blank to not use it.</p>
      <button type="button" className="secondary" onClick={() => setRules([...rules, emptyRule(rules.length + 1)])}>Add a rule</button>
      <DefinitionFooter definition={definition} editing={editing} state={state} pending={pending} noun="limit set" />
    </ActionForm>
  );
}
