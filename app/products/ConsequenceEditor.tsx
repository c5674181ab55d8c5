"use client";

import { NumberField, num } from "@/app/components/NumberField";
import type { ConsequenceModel } from "@/lib/consequence/definitions";
import { DEPENDENCE_TEMPLATES } from "@/lib/consequence/templates";

/** One growth or shelf-life model as typed (strings, kept as the user wrote them). */
export type ConsequenceRow = Record<string, string>;

const SHELF_FIELDS: Array<[string, string, string?]> = [
  ["reference_C", "Reference temperature (°C)", "Where the shelf life below is known"],
  ["shelf_life_days", "Shelf life at the reference (days)"],
  ["storage_C", "Storage temperature for the remaining life (°C), optional", "Defaults to the reference"],
];
const DEPENDENCE_FIELD: Record<string, [string, string, string]> = {
  sqrt: ["tmin_C", "Notional minimum temperature Tmin (°C)", "Square-root model: rate ∝ (T − Tmin)², none below Tmin (Ratkowsky et al. 1982; Dalgaard 2002)"],
  arrhenius: ["ea_kJ_mol", "Activation energy Ea (kJ/mol)", "Arrhenius: rate ∝ exp(−Ea/RT)"],
  q10: ["q10", "Q10", "The rate multiplies by Q10 for every 10 K"],
};
const GROWTH_FIELDS: Array<[string, string, string?]> = [
  ["b_per_C_sqrt_h", "b (1/(°C·√h))", "√μmax = b·(T − Tmin), μmax in 1/h, natural-log units (Ratkowsky et al. 1982)"],
  ["tmin_C", "Tmin (°C)"],
  ["tmax_C", "Tmax (°C), optional", "With c: the extended model of Ratkowsky et al. (1983)"],
  ["c_per_C", "c (1/°C), optional"],
  ["lag_h", "Lag time (h) at the initial temperature, optional", "Turned into q0 by h0 = μmax·λ at the product's initial temperature"],
  ["q0", "or q0, optional", "Physiological state (Baranyi and Roberts 1994); neither: no lag"],
  ["initial_log10", "Initial count (log10 CFU/g), optional"],
  ["max_log10", "Maximum population (log10 CFU/g), optional"],
];

export function rowsFromModels(models: readonly ConsequenceModel[] | undefined): ConsequenceRow[] {
  return (models ?? []).map((m) => Object.fromEntries(Object.entries(m).map(([k, v]) => [k, String(v)])));
}

/** The models as the schema reads them: numbers where numbers belong, blanks left out (NaN → null for zod to name). */
export function modelsFromRows(rows: readonly ConsequenceRow[]): unknown[] {
  const text = new Set(["id", "kind", "organism", "source", "dependence"]);
  return rows.map((r) => {
    const keep = r.kind === "growth" ? ["id", "kind", "organism", "source", ...GROWTH_FIELDS.map(([k]) => k)] : ["id", "kind", "dependence", ...SHELF_FIELDS.map(([k]) => k), DEPENDENCE_FIELD[r.dependence ?? "sqrt"]![0]];
    return Object.fromEntries(keep.filter((k) => (r[k] ?? "").trim() !== "").map((k) => [k, text.has(k) ? r[k]!.trim() : (num(r[k]) ?? null)]));
  });
}

const newRow = (kind: "growth" | "shelf_life", n: number): ConsequenceRow =>
  kind === "growth" ? { kind, id: `growth-${n}`, organism: "", source: "" } : { kind, id: `shelf-${n}`, dependence: "sqrt" };

/** The product's growth and shelf-life models: add, edit, remove; errors shown by field (consequences.N.field). */
export function ConsequenceEditor({ rows, onChange, err }: { rows: ConsequenceRow[]; onChange: (rows: ConsequenceRow[]) => void; err: (path: string) => string | undefined }) {
  const set = (i: number, k: string) => (v: string) => onChange(rows.map((r, j) => (j === i ? { ...r, [k]: v } : r)));
  return (
    <fieldset data-testid="consequences">
      <legend>Growth and shelf life (optional)</legend>
      <p className="hint muted">
        Models applied to the predicted history in a review. Enter parameters from the original paper for this organism and food, or your own data; they must be
        validated for this product, and the estimates do not replace challenge tests, your shelf-life studies or local regulations.
      </p>
      {err("consequences") && <span className="field-error">{err("consequences")}</span>}
      {rows.map((r, i) => {
        const e = (k: string) => err(`consequences.${i}.${k}`);
        const text = (k: string, label: string, hint?: string) => (
          <label>
            {label}
            {hint && <span className="hint">{hint}</span>}
            <input value={r[k] ?? ""} onChange={(ev) => set(i, k)(ev.target.value)} aria-invalid={e(k) ? true : undefined} data-testid={`cons-${i}-${k}`} />
            {e(k) && <span className="field-error" data-testid={`error-cons-${i}-${k}`}>{e(k)}</span>}
          </label>
        );
        const number = ([k, label, hint]: [string, string, string?]) => <NumberField key={k} label={label} hint={hint} value={r[k] ?? ""} onChange={set(i, k)} error={e(k)} testId={`cons-${i}-${k}`} />;
        return (
          <div key={i} className="card stack" data-testid={`cons-${i}`}>
            <strong>{r.kind === "growth" ? "Growth of an organism" : "Shelf life consumed"}</strong>
            {text("id", "Model id", "Rules in a limit set name the model by this id")}
            {r.kind === "growth" ? (
              <>
                {text("organism", "Organism (free text)")}
                {GROWTH_FIELDS.map(number)}
                {text("source", "Source of the parameters", "The original paper, or 'own data'")}
              </>
            ) : (
              <>
                {SHELF_FIELDS.map(number)}
                <label>
                  Start from a published temperature dependence (optional)
                  <select
                    value={r.template ?? ""}
                    data-testid={`cons-${i}-template`}
                    onChange={(ev) => {
                      const t = DEPENDENCE_TEMPLATES.find((x) => x.key === ev.target.value);
                      const next: ConsequenceRow = { ...r, template: ev.target.value };
                      if (t) for (const [k, v] of Object.entries(t.fields)) next[k] = String(v);
                      onChange(rows.map((x, j) => (j === i ? next : x)));
                    }}
                  >
                    <option value="">(none: enter your own)</option>
                    {DEPENDENCE_TEMPLATES.map((t) => <option key={t.key} value={t.key}>{t.title}</option>)}
                  </select>
                </label>
                {r.template && DEPENDENCE_TEMPLATES.find((t) => t.key === r.template) && (
                  <p className="caution" data-testid={`cons-${i}-template-source`}>Source: {DEPENDENCE_TEMPLATES.find((t) => t.key === r.template)!.source}</p>
                )}
                <label>
                  Temperature dependence
                  <select value={r.dependence ?? "sqrt"} onChange={(ev) => set(i, "dependence")(ev.target.value)} data-testid={`cons-${i}-dependence`}>
                    <option value="sqrt">square root with Tmin</option>
                    <option value="arrhenius">Arrhenius (Ea)</option>
                    <option value="q10">Q10</option>
                  </select>
                </label>
                {number(DEPENDENCE_FIELD[r.dependence ?? "sqrt"]!)}
              </>
            )}
            <button type="button" className="secondary" onClick={() => onChange(rows.filter((_, j) => j !== i))}>Remove this model</button>
          </div>
        );
      })}
      <div style={{ display: "flex", gap: "0.5rem" }}>
        <button type="button" className="secondary" onClick={() => onChange([...rows, newRow("shelf_life", rows.length + 1)])} data-testid="add-shelf-life">Add a shelf-life model</button>
        <button type="button" className="secondary" onClick={() => onChange([...rows, newRow("growth", rows.length + 1)])} data-testid="add-growth">Add a growth model</button>
      </div>
    </fieldset>
  );
}
