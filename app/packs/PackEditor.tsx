"use client";

import { ActionForm } from "@/app/components/ActionForm";
import { useActionState, useMemo, useState } from "react";
import { savePack } from "@/app/actions/definitions";
import { DefinitionFooter } from "@/app/components/DefinitionFooter";
import { NumberField, num } from "@/app/components/NumberField";
import { packSchema, type Pack } from "@/lib/thermal/definitions";
import { resistances } from "@/lib/thermal/resistances";
import { ResistanceTable } from "@/app/products/ProductEditor";
import type { FormState } from "@/lib/validation";
import { sig } from "@/lib/display/numbers";

type Row = Record<string, string>;
const LAYER = ["thickness_m", "k_W_mK"] as const;
const COOLANT = ["mass_kg", "melt_C", "latent_J_kg", "cp_solid_J_kgK", "cp_liquid_J_kgK", "initial_C"] as const;
/** Optional coolant fields: with a surface area the coolant is its own node with its own film (and contact). */
const COOLANT_OPTIONAL = ["area_m2", "h_W_m2K", "contact_area_m2", "h_contact_W_m2K"] as const;
const COOLANT_LABELS: Record<(typeof COOLANT)[number] | (typeof COOLANT_OPTIONAL)[number], string> = {
  mass_kg: "mass kg", melt_C: "melt °C", latent_J_kg: "latent J/kg", cp_solid_J_kgK: "cp solid", cp_liquid_J_kgK: "cp liquid", initial_C: "initial °C",
  area_m2: "surface m² (optional)", h_W_m2K: "film W/m²·K (optional)", contact_area_m2: "contact m² (optional)", h_contact_W_m2K: "contact W/m²·K (optional)",
};
/** Optional layer fields: with both the layer stores heat. */
const LAYER_OPTIONAL = ["density_kg_m3", "cp_J_kgK"] as const;
const LAYER_OPTIONAL_LABELS = { density_kg_m3: "density kg/m³ (optional)", cp_J_kgK: "cp J/kg·K (optional)" } as const;
/** Optional fields go into the definition only when filled in. */
const filled = (row: Row, keys: readonly string[]) => Object.fromEntries(keys.filter((k) => (row[k] ?? "") !== "").map((k) => [k, num(row[k]) ?? null]));

const str = (v: unknown) => (v === undefined ? "" : String(v));

export function PackEditor({ editing }: { editing?: { id: string; lineage: string; version: number; body: Pack } }) {
  const [state, action, pending] = useActionState<FormState, FormData>(savePack, {});
  const b = editing?.body;
  const [head, setHead] = useState<Row>({
    name: b?.name ?? "", h_outside_W_m2K: str(b?.h_outside_W_m2K ?? 8), h_inside_W_m2K: str(b?.h_inside_W_m2K), emissivity: str(b?.emissivity), area_m2: str(b?.area_m2),
  });
  const [layers, setLayers] = useState<Row[]>(b?.layers.map((l) => ({ name: l.name, thickness_m: str(l.thickness_m), k_W_mK: str(l.k_W_mK), density_kg_m3: str(l.density_kg_m3), cp_J_kgK: str(l.cp_J_kgK) })) ?? []);
  const [coolants, setCoolants] = useState<Row[]>(b?.coolants.map((c) => Object.fromEntries(Object.entries(c).map(([k, v]) => [k, str(v)]))) ?? []);
  const err = (p: string) => state.fieldErrors?.[p];

  const def = useMemo(
    () =>
      JSON.parse(
        JSON.stringify({
          name: head.name,
          h_outside_W_m2K: num(head.h_outside_W_m2K) ?? null,
          h_inside_W_m2K: num(head.h_inside_W_m2K),
          emissivity: num(head.emissivity),
          area_m2: num(head.area_m2),
          layers: layers.map((l) => ({ name: l.name, thickness_m: num(l.thickness_m) ?? null, k_W_mK: num(l.k_W_mK) ?? null, ...filled(l, LAYER_OPTIONAL) })),
          coolants: coolants.map((c) => ({ name: c.name, ...Object.fromEntries(COOLANT.map((k) => [k, num(c[k]) ?? null])), ...filled(c, COOLANT_OPTIONAL) })),
        }),
      ),
    [head, layers, coolants],
  );
  const preview = useMemo(() => {
    const p = packSchema.safeParse(def);
    if (!p.success || p.data.area_m2 === undefined) return null;
    // A plane-wall pack's own resistance, referred to its wall area (product film left out: it depends on the product).
    const r = resistances({ name: "", initial_C: 20, area_m2: p.data.area_m2, mass_kg: 1, properties: { cp_J_kgK: 1 } }, null, p.data.area_m2, { ...p.data, h_inside_W_m2K: undefined }, 20);
    return r;
  }, [def]);

  return (
    <div className="grid2">
      <ActionForm action={action} className="stack" aria-label="Pack definition">
        {editing && <p className="muted">Editing version {editing.version}: saving creates version {editing.version + 1}.</p>}
        <label>
          Name
          <input value={head.name} onChange={(e) => setHead({ ...head, name: e.target.value })} data-testid="pack-name" aria-invalid={err("name") ? true : undefined} />
          {err("name") && <span className="field-error">{err("name")}</span>}
        </label>
        <NumberField label="Outside coefficient h (W/m²·K)" hint="Still air 7–9 with radiation; forced air 25 and up" value={head.h_outside_W_m2K!} onChange={(v) => setHead({ ...head, h_outside_W_m2K: v })} error={err("h_outside_W_m2K")} />
        <NumberField label="Inside coefficient h (W/m²·K), optional" hint="Inner air to the product; required with coolant" value={head.h_inside_W_m2K!} onChange={(v) => setHead({ ...head, h_inside_W_m2K: v })} error={err("h_inside_W_m2K")} />
        <NumberField label="Outer surface emissivity, optional" hint="Adds linearised radiation to the outside film" value={head.emissivity!} onChange={(v) => setHead({ ...head, emissivity: v })} error={err("emissivity")} />
        <NumberField label="Wall area (m²), optional" hint="Plane walls over this area; without it, layers wrap the product" value={head.area_m2!} onChange={(v) => setHead({ ...head, area_m2: v })} error={err("area_m2")} />
        <h3>Wall layers, outside to inside</h3>
        {layers.map((l, i) => (
          <div key={i} style={{ display: "flex", gap: "0.5rem", alignItems: "end" }} data-testid={`layer-${i}`}>
            <label>name<input value={l.name} size={12} onChange={(e) => setLayers(layers.map((x, j) => (j === i ? { ...x, name: e.target.value } : x)))} /></label>
            {LAYER.map((k) => (
              <NumberField key={k} label={k === "thickness_m" ? "thickness m" : "k W/m·K"} width={7} value={l[k] ?? ""} onChange={(v) => setLayers(layers.map((x, j) => (j === i ? { ...x, [k]: v } : x)))} error={err(`layers.${i}.${k}`)} />
            ))}
            {LAYER_OPTIONAL.map((k) => (
              <NumberField key={k} label={LAYER_OPTIONAL_LABELS[k]} width={7} value={l[k] ?? ""} onChange={(v) => setLayers(layers.map((x, j) => (j === i ? { ...x, [k]: v } : x)))} error={err(`layers.${i}.${k}`)} />
            ))}
            <button type="button" className="secondary" onClick={() => setLayers(layers.filter((_, j) => j !== i))}>Remove</button>
          </div>
        ))}
        <button type="button" className="secondary" onClick={() => setLayers([...layers, { name: `layer ${layers.length + 1}`, thickness_m: "", k_W_mK: "" }])}>Add a layer</button>
        <h3>Coolant packs</h3>
        {coolants.map((c, i) => (
          <div key={i} style={{ display: "flex", flexWrap: "wrap", gap: "0.5rem", alignItems: "end" }} data-testid={`coolant-${i}`}>
            <label>name<input value={c.name ?? ""} size={10} onChange={(e) => setCoolants(coolants.map((x, j) => (j === i ? { ...x, name: e.target.value } : x)))} /></label>
            {[...COOLANT, ...COOLANT_OPTIONAL].map((k) => (
              <NumberField key={k} label={COOLANT_LABELS[k]} width={7} value={c[k] ?? ""} onChange={(v) => setCoolants(coolants.map((x, j) => (j === i ? { ...x, [k]: v } : x)))} error={err(`coolants.${i}.${k}`)} />
            ))}
            <button type="button" className="secondary" onClick={() => setCoolants(coolants.filter((_, j) => j !== i))}>Remove</button>
          </div>
        ))}
        <button type="button" className="secondary" onClick={() => setCoolants([...coolants, { name: "gel pack", mass_kg: "", melt_C: "0", latent_J_kg: "", cp_solid_J_kgK: "", cp_liquid_J_kgK: "", initial_C: "" }])}>Add a coolant</button>
        <DefinitionFooter definition={def} editing={editing} state={state} pending={pending} noun="pack" />
      </ActionForm>
      <div>
        <h2 style={{ marginTop: 0 }}>Wall resistance</h2>
        {preview ? (
          <div data-testid="pack-preview">
            <p>Outside film and layers over {num(head.area_m2)} m²: R = {sig(preview.r_wall_K_W, 3)} K/W, U = {(1 / (preview.r_wall_K_W * num(head.area_m2)!)).toPrecision(3)} W/m²·K{preview.h_radiation_W_m2K > 0 ? ` (radiation adds ${preview.h_radiation_W_m2K.toFixed(1)} W/m²·K at 20 °C)` : ""}.</p>
            <ResistanceTable items={preview.items} />
            <p className="muted">For reference, the ATP agreement classes insulated bodies by K ≤ 0.70 W/m²·K (normal) and K ≤ 0.40 W/m²·K (heavy insulation). The product&apos;s own film and tau appear in the product editor when you preview with this pack.</p>
          </div>
        ) : (
          <p className="muted" data-testid="pack-preview">Give a wall area to see the wall&apos;s resistance here; with the layers wrapped around a sphere or cylinder, see the product editor.</p>
        )}
      </div>
    </div>
  );
}
