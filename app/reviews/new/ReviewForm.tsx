"use client";

import { useActionState } from "react";
import { startReview } from "@/app/actions/reviews";
import { Field, FormMessage } from "@/app/components/Field";
import type { FormState } from "@/lib/validation";

interface Option { id: string; label: string }

function Select({ name, label, options, state, initial, blank }: { name: string; label: string; options: Option[]; state: FormState; initial?: string; blank?: string }) {
  const error = state.fieldErrors?.[name];
  return (
    <label htmlFor={`f-${name}`}>
      {label}
      <select id={`f-${name}`} name={name} defaultValue={state.values?.[name] ?? initial ?? (blank !== undefined ? "" : options[0]?.id) ?? ""} aria-invalid={error ? true : undefined}>
        {blank !== undefined && <option value="">{blank}</option>}
        {blank === undefined && options.length === 0 && <option value="">(none stored yet)</option>}
        {options.map((o) => <option key={o.id} value={o.id}>{o.label}</option>)}
      </select>
      {error && <span className="field-error" data-testid={`error-${name}`}>{error}</span>}
    </label>
  );
}

export function ReviewForm({ traces, products, packs, limits, initialTrace }: { traces: Option[]; products: Option[]; packs: Option[]; limits: Option[]; initialTrace?: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(startReview, {});
  return (
    <form action={action} className="stack" aria-label="Run a review">
      <Field name="title" label="Title" hint="e.g. 'Route 7, 16 June, tote 3'" state={state} required />
      <Select name="traceId" label="Trace" options={traces} state={state} initial={initialTrace} />
      <Select name="productId" label="Product" options={products} state={state} />
      <Select name="packId" label="Pack" options={packs} state={state} blank="(none: the product's own surface coefficient)" />
      <Select name="limitsId" label="Limit set" options={limits} state={state} />
      <Select
        name="model"
        label="Model"
        options={[
          { id: "auto", label: "auto: lumped when Bi < 0.1, else 1-D conduction" },
          { id: "lumped", label: "lumped capacitance" },
          { id: "conduction", label: "1-D conduction" },
        ]}
        state={state}
      />
      <FormMessage state={state} />
      <button type="submit" disabled={pending}>{pending ? "Running…" : "Run review"}</button>
    </form>
  );
}
