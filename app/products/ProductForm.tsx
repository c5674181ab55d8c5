"use client";

import { useActionState, useState } from "react";
import { createProduct } from "@/app/actions/products";
import { Field, FormMessage } from "@/app/components/Field";
import { bareProductSchema } from "@/lib/thermal/product";
import { readableDuration, screenBareProduct } from "@/lib/thermal/screening";
import type { FormState } from "@/lib/validation";

const num = (v: FormDataEntryValue | null) => (v === null || String(v).trim() === "" ? undefined : Number(v));

/** Screening numbers recomputed as the user types, from the same engine code the review uses. */
function LivePreview({ form }: { form: HTMLFormElement | null }) {
  if (!form) return null;
  const fd = new FormData(form);
  const parsed = bareProductSchema.safeParse({
    name: "preview",
    mass_kg: num(fd.get("mass_kg")),
    properties: { cp_J_kgK: num(fd.get("cp_J_kgK")), density_kg_m3: num(fd.get("density_kg_m3")), k_W_mK: num(fd.get("k_W_mK")) },
    area_m2: num(fd.get("area_m2")),
    h_W_m2K: num(fd.get("h_W_m2K")),
    initial_C: num(fd.get("initial_C")) ?? 0,
  });
  if (!parsed.success) return <p className="muted" data-testid="product-preview">Fill in mass, specific heat, area and h to see the time constant.</p>;
  const s = screenBareProduct(parsed.data);
  return (
    <dl className="facts" data-testid="product-preview">
      <dt>C = m·cp</dt><dd>{s.c_total_J_K.toPrecision(4)} J/K</dd>
      <dt>R = 1/(h·A)</dt><dd>{s.r_total_K_W.toPrecision(4)} K/W</dd>
      <dt>tau = R·C</dt><dd>{readableDuration(s.tau_s)} ({Math.round(s.tau_s)} s)</dd>
      <dt>Lc = V/A</dt><dd>{s.lc_m === null ? "needs density" : `${(s.lc_m * 1000).toPrecision(3)} mm`}</dd>
      <dt>Biot number</dt><dd>{s.biot === null ? "needs density and conductivity" : s.biot.toPrecision(2)}</dd>
      <dt>Model</dt><dd>lumped: {s.reason}</dd>
    </dl>
  );
}

export function ProductForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(createProduct, {});
  const [form, setForm] = useState<HTMLFormElement | null>(null);
  const [, setTick] = useState(0);
  return (
    <div className="grid2">
      <form action={action} className="stack" ref={setForm} onInput={() => setTick((t) => t + 1)} aria-label="Define a product">
        <Field name="name" label="Name" state={state} required />
        <Field name="mass_kg" label="Mass (kg)" inputMode="decimal" state={state} required />
        <Field name="cp_J_kgK" label="Specific heat (J/kg·K)" hint="Chilled meals are typically 3,300–3,800 J/kg·K" errorKey="properties.cp_J_kgK" inputMode="decimal" state={state} required />
        <Field name="area_m2" label="Surface area (m²)" inputMode="decimal" state={state} required />
        <Field name="h_W_m2K" label="Surface heat-transfer coefficient h (W/m²·K)" hint="Still air with radiation: about 7–9; inside an insulated tote, the overall value is lower" inputMode="decimal" state={state} required />
        <Field name="initial_C" label="Initial temperature (°C)" hint="Product temperature at the first sample" inputMode="decimal" state={state} required />
        <Field name="density_kg_m3" label="Density (kg/m³), optional" hint="With conductivity, enables the Biot check" errorKey="properties.density_kg_m3" inputMode="decimal" state={state} />
        <Field name="k_W_mK" label="Thermal conductivity (W/m·K), optional" errorKey="properties.k_W_mK" inputMode="decimal" state={state} />
        <FormMessage state={state} />
        <button type="submit" disabled={pending}>{pending ? "Saving…" : "Save product"}</button>
      </form>
      <div>
        <h2 style={{ marginTop: 0 }}>Screening preview</h2>
        <LivePreview form={form} />
      </div>
    </div>
  );
}
