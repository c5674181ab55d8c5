"use client";

import { ActionForm } from "@/app/components/ActionForm";
import { useActionState, useMemo, useState } from "react";
import { saveProduct } from "@/app/actions/definitions";
import { DefinitionFooter } from "@/app/components/DefinitionFooter";
import { NumberField, num } from "@/app/components/NumberField";
import { productSchema, packSchema, type Pack, type Product } from "@/lib/thermal/definitions";
import { screenDefinition } from "@/lib/thermal/predict";
import { resolveProduct } from "@/lib/thermal/resolve";
import type { FormState } from "@/lib/validation";
import { sig } from "@/lib/display/numbers";
import { ConsequenceEditor, modelsFromRows, rowsFromModels, type ConsequenceRow } from "./ConsequenceEditor";

type ShapeKind = "none" | "sphere" | "cylinder" | "slab" | "box";
type S = Record<string, string>;

const DIMENSIONS: Record<Exclude<ShapeKind, "none">, Array<[string, string]>> = {
  sphere: [["radius_m", "Radius (m)"]],
  cylinder: [["radius_m", "Radius (m)"], ["length_m", "Length (m)"]],
  slab: [["thickness_m", "Thickness (m)"], ["width_m", "Width (m)"], ["length_m", "Length (m)"]],
  box: [["x_m", "x (m)"], ["y_m", "y (m)"], ["z_m", "z (m)"]],
};
const COMPONENTS = ["water", "protein", "fat", "carbohydrate", "fiber", "ash"] as const;

function stateFrom(p?: Product): S {
  if (!p) return { shape: "none", source: "properties" };
  const s: S = { name: p.name, initial_C: String(p.initial_C), shape: p.shape?.kind ?? "none", source: p.composition ? "composition" : "properties" };
  if (p.shape) for (const [k, v] of Object.entries(p.shape)) if (k !== "kind") s[`shape.${k}`] = String(v);
  for (const k of ["mass_kg", "area_m2", "h_W_m2K", "freezing_point_C"] as const) if (p[k] !== undefined) s[k] = String(p[k]);
  if (p.properties) for (const [k, v] of Object.entries(p.properties)) if (v !== undefined) s[`properties.${k}`] = String(v);
  if (p.composition) for (const c of COMPONENTS) s[`composition.${c}`] = String(p.composition[c]);
  if (p.respiration?.model === "constant") s["respiration.W_kg"] = String(p.respiration.W_kg);
  if (p.respiration?.model === "becker-fricke") [s["respiration.f"], s["respiration.g"]] = [String(p.respiration.f), String(p.respiration.g)];
  return s;
}

function definitionFrom(s: S, consequences: ConsequenceRow[]): unknown {
  const shape = s.shape === "none" ? undefined : Object.fromEntries([["kind", s.shape], ...DIMENSIONS[s.shape as Exclude<ShapeKind, "none">].map(([k]) => [k, num(s[`shape.${k}`]) ?? null])]);
  const def: Record<string, unknown> = {
    name: s.name ?? "",
    shape,
    mass_kg: num(s.mass_kg),
    area_m2: num(s.area_m2),
    h_W_m2K: num(s.h_W_m2K),
    initial_C: num(s.initial_C) ?? null,
  };
  if (s.source === "composition") {
    def.composition = Object.fromEntries(COMPONENTS.map((c) => [c, num(s[`composition.${c}`]) ?? (c === "water" ? null : 0)]));
    def.freezing_point_C = num(s.freezing_point_C);
  } else {
    def.properties = {
      cp_J_kgK: num(s["properties.cp_J_kgK"]) ?? null,
      density_kg_m3: num(s["properties.density_kg_m3"]),
      k_W_mK: num(s["properties.k_W_mK"]),
    };
  }
  // heat of respiration: a constant W/kg, or Becker and Fricke's f and g
  if ((s["respiration.W_kg"] ?? "") !== "") def.respiration = { model: "constant", W_kg: num(s["respiration.W_kg"]) ?? null };
  else if ((s["respiration.f"] ?? "") !== "" || (s["respiration.g"] ?? "") !== "") def.respiration = { model: "becker-fricke", f: num(s["respiration.f"]) ?? null, g: num(s["respiration.g"]) ?? null };
  if (consequences.length > 0) def.consequences = modelsFromRows(consequences);
  return JSON.parse(JSON.stringify(def)); // drops undefined, turns NaN into null for zod to name
}

/** Screening numbers recomputed as the user types, with the same engine code the review uses. */
function Preview({ def, pack, atC }: { def: unknown; pack: Pack | undefined; atC: number }) {
  const parsed = productSchema.safeParse(def);
  if (!parsed.success) {
    const first = parsed.error.issues[0]!;
    return <p className="muted" data-testid="product-preview">Complete the definition to see the screening ({first.path.join(".") || "form"}: {first.message}).</p>;
  }
  if (!pack && parsed.data.h_W_m2K === undefined) return <p className="muted" data-testid="product-preview">Give h or choose a pack to preview with.</p>;
  let s, r;
  try {
    // the range from the initial temperature to the one shown: a freezing point is estimated when it reaches below 0 °C
    const t0 = parsed.data.initial_C;
    s = screenDefinition(parsed.data, pack, "auto", t0, { lo_C: Math.min(t0, atC), hi_C: Math.max(t0, atC) });
    r = resolveProduct(parsed.data, Math.min(t0, atC));
  } catch (e) {
    return <p className="field-error" data-testid="product-preview">{(e as Error).message}</p>;
  }
  const m = r.material;
  const rho = m.density(atC), k = m.conductivity(atC);
  return (
    <div data-testid="product-preview">
      <dl className="facts">
        <dt>At {atC} °C</dt>
        <dd>
          ρ {Number.isFinite(rho) ? `${rho.toFixed(0)} kg/m³` : "–"}, cp {m.apparentCp(atC).toFixed(0)} J/kg·K, k {Number.isFinite(k) ? `${k.toFixed(3)} W/m·K` : "–"}
          {m.ice(atC) > 0 ? `, ice ${(m.ice(atC) * 100).toFixed(0)} %` : ""}
        </dd>
        <dt>Mass</dt><dd>{sig(s.mass_kg, 4)} kg</dd>
        <dt>V, A</dt><dd>{r.volume_m3 === null ? "V unknown" : `${sig((r.volume_m3 * 1e3), 4)} L`}, {sig(s.area_m2, 4)} m²</dd>
        <dt>Lc = V/A</dt><dd>{s.lc_m === null ? "needs volume" : `${sig((s.lc_m * 1000), 3)} mm`}</dd>
        <dt>C = m·cp</dt><dd>{sig(s.c_total_J_K, 4)} J/K</dd>
        <dt>R total</dt><dd>{sig(s.r_total_K_W, 4)} K/W (U = {sig(s.u_product_W_m2K, 3)} W/m²·K on the product)</dd>
        <dt>tau = R·C</dt><dd data-testid="preview-tau">{s.tau_readable}</dd>
        <dt>Biot number</dt><dd>{s.biot === null ? "not known" : sig(s.biot, 2)}</dd>
        <dt>Model (auto)</dt><dd data-testid="preview-model">{s.model}: {s.reason}</dd>
        {s.notes.length > 0 && <><dt>Notes</dt><dd data-testid="preview-notes">{s.notes.join("; ")}</dd></>}
      </dl>
      <ResistanceTable items={s.resistances} />
    </div>
  );
}

export function ResistanceTable({ items }: { items: Array<{ name: string; kind: string; r_K_W: number; share: number }> }) {
  return (
    <table style={{ marginTop: "0.6rem" }}>
      <thead><tr><th>Resistance</th><th className="num">K/W</th><th className="num">share</th></tr></thead>
      <tbody>
        {items.map((i) => (
          <tr key={i.name + i.kind}><td>{i.name} <span className="muted">({i.kind})</span></td><td className="num">{sig(i.r_K_W, 3)}</td><td className="num">{(i.share * 100).toFixed(0)} %</td></tr>
        ))}
      </tbody>
    </table>
  );
}

export function ProductEditor({ editing, packs }: { editing?: { id: string; lineage: string; version: number; body: Product }; packs: Array<{ id: string; name: string; body: unknown }> }) {
  const [state, action, pending] = useActionState<FormState, FormData>(saveProduct, {});
  const [s, setS] = useState<S>(() => stateFrom(editing?.body));
  const [previewPack, setPreviewPack] = useState("");
  const [atC, setAtC] = useState("4");
  const set = (k: string) => (v: string) => setS({ ...s, [k]: v });
  const err = (path: string) => state.fieldErrors?.[path];
  const [consequences, setConsequences] = useState<ConsequenceRow[]>(() => rowsFromModels(editing?.body.consequences));
  const def = useMemo(() => definitionFrom(s, consequences), [s, consequences]);
  const pack = useMemo(() => {
    const p = packs.find((x) => x.id === previewPack);
    const r = p ? packSchema.safeParse(p.body) : null;
    return r?.success ? r.data : undefined;
  }, [previewPack, packs]);
  const shape = s.shape as ShapeKind;

  return (
    <div className="grid2">
      <ActionForm action={action} className="stack" aria-label="Product definition">
        {editing && <p className="muted">Editing version {editing.version}: saving creates version {editing.version + 1}.</p>}
        <label>
          Name
          <input value={s.name ?? ""} onChange={(e) => set("name")(e.target.value)} aria-invalid={err("name") ? true : undefined} data-testid="product-name" />
          {err("name") && <span className="field-error">{err("name")}</span>}
        </label>
        <NumberField label="Initial temperature (°C)" hint="Product temperature at the first sample" value={s.initial_C ?? ""} onChange={set("initial_C")} error={err("initial_C")} testId="initial_C" />
        <label>
          Shape
          <select value={shape} onChange={(e) => set("shape")(e.target.value)} data-testid="shape-kind">
            <option value="none">none (lumped only: give mass and surface area)</option>
            <option value="sphere">sphere</option>
            <option value="cylinder">cylinder</option>
            <option value="slab">slab</option>
            <option value="box">box</option>
          </select>
          {err("shape") && <span className="field-error">{err("shape")}</span>}
        </label>
        {shape !== "none" &&
          DIMENSIONS[shape].map(([k, label]) => (
            <NumberField key={k} label={label} value={s[`shape.${k}`] ?? ""} onChange={set(`shape.${k}`)} error={err(`shape.${k}`)} testId={`shape-${k}`} />
          ))}
        <NumberField label={shape === "none" ? "Mass (kg)" : "Mass (kg), optional"} hint={shape === "none" ? undefined : "Defaults to density × volume"} value={s.mass_kg ?? ""} onChange={set("mass_kg")} error={err("mass_kg")} testId="mass_kg" />
        <NumberField label={shape === "none" ? "Surface area (m²)" : "Surface area (m²), optional"} hint={shape === "none" ? undefined : "Defaults to the shape's area"} value={s.area_m2 ?? ""} onChange={set("area_m2")} error={err("area_m2")} testId="area_m2" />
        <NumberField label="Surface heat-transfer coefficient h (W/m²·K), optional with a pack" hint="Still air with radiation: about 7–9; an insulated tote's overall value is lower" value={s.h_W_m2K ?? ""} onChange={set("h_W_m2K")} error={err("h_W_m2K")} testId="h_W_m2K" />
        <fieldset>
          <legend>Thermal properties</legend>
          <label style={{ fontWeight: 400 }}>
            <input type="radio" name="source" value="properties" checked={s.source !== "composition"} data-testid="source-properties" onChange={() => set("source")("properties")} /> given values
          </label>
          <label style={{ fontWeight: 400 }}>
            <input type="radio" name="source" value="composition" checked={s.source === "composition"} onChange={() => set("source")("composition")} data-testid="source-composition" /> from composition (Choi–Okos)
          </label>
          {s.source !== "composition" ? (
            <div className="stack">
              <NumberField label="Specific heat (J/kg·K)" hint="Chilled meals are typically 3,300–3,800" value={s["properties.cp_J_kgK"] ?? ""} onChange={set("properties.cp_J_kgK")} error={err("properties.cp_J_kgK") ?? err("properties")} testId="cp_J_kgK" />
              <NumberField label="Density (kg/m³), optional" value={s["properties.density_kg_m3"] ?? ""} onChange={set("properties.density_kg_m3")} error={err("properties.density_kg_m3")} testId="density_kg_m3" />
              <NumberField label="Conductivity (W/m·K), optional" hint="Needed for the Biot check and conduction" value={s["properties.k_W_mK"] ?? ""} onChange={set("properties.k_W_mK")} error={err("properties.k_W_mK")} testId="k_W_mK" />
            </div>
          ) : (
            <div className="stack">
              <p className="hint muted">Mass fractions, summing to 1.</p>
              {COMPONENTS.map((c) => (
                <NumberField key={c} label={c} value={s[`composition.${c}`] ?? ""} onChange={set(`composition.${c}`)} error={err(`composition.${c}`)} testId={`composition-${c}`} />
              ))}
              {err("composition") && <span className="field-error">{err("composition")}</span>}
              <NumberField label="Initial freezing point (°C), optional" hint="Below it, ice forms (Tchigeov's ice fraction)" value={s.freezing_point_C ?? ""} onChange={set("freezing_point_C")} error={err("freezing_point_C")} testId="freezing_point_C" />
            </div>
          )}
          <NumberField label="Respiration (W/kg), optional" hint="Fresh produce: constant heat of respiration" value={s["respiration.W_kg"] ?? ""} onChange={set("respiration.W_kg")} error={err("respiration.W_kg")} testId="respiration-W_kg" />
          <NumberField label="or Becker–Fricke f" hint="W = (10.7·f/3600)·(9t/5+32)^g W/kg (ASHRAE tables)" value={s["respiration.f"] ?? ""} onChange={set("respiration.f")} error={err("respiration.f")} testId="respiration-f" />
          <NumberField label="and g" value={s["respiration.g"] ?? ""} onChange={set("respiration.g")} error={err("respiration.g")} testId="respiration-g" />
        </fieldset>
        <ConsequenceEditor rows={consequences} onChange={setConsequences} err={err} />
        <DefinitionFooter definition={def} editing={editing} state={state} pending={pending} noun="product" />
      </ActionForm>
      <div>
        <h2 style={{ marginTop: 0 }}>Screening preview</h2>
        <div className="stack" style={{ display: "grid", gap: "0.5rem", marginBottom: "0.8rem" }}>
          <label>
            Preview with pack
            <select value={previewPack} onChange={(e) => setPreviewPack(e.target.value)}>
              <option value="">(none: the product&apos;s own h)</option>
              {packs.map((p) => <option key={p.id} value={p.id}>{p.name}</option>)}
            </select>
          </label>
          <NumberField label="Properties at (°C)" value={atC} onChange={setAtC} width={6} />
        </div>
        <Preview def={def} pack={pack} atC={num(atC) ?? 4} />
      </div>
    </div>
  );
}
