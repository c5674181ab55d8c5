"use client";

import { ActionForm } from "@/app/components/ActionForm";
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

export interface ReviewFormInitial {
  trace?: string;
  product?: string;
  pack?: string;
  limits?: string;
  model?: string;
  corrects?: { id: string; title: string };
}

export function ReviewForm({ traces, products, packs, limits, initial }: { traces: Option[]; products: Option[]; packs: Option[]; limits: Option[]; initial: ReviewFormInitial }) {
  const [state, action, pending] = useActionState<FormState, FormData>(startReview, {});
  return (
    <ActionForm action={action} className="stack" aria-label="Run a review">
      {initial.corrects && (
        <p className="caution" data-testid="correcting">
          Correcting the signed review “{initial.corrects.title}”. The new review will point back to it; the original stays as it was.
          <input type="hidden" name="correctsId" value={initial.corrects.id} />
        </p>
      )}
      <Field name="title" label="Title" hint="e.g. 'Route 7, 16 June, tote 3'" defaultValue={initial.corrects ? `${initial.corrects.title} (correction)` : undefined} state={state} required />
      <Select name="traceId" label="Trace" options={traces} state={state} initial={initial.trace} />
      <Select name="productId" label="Product" options={products} state={state} initial={initial.product} />
      <Select name="packId" label="Pack" options={packs} state={state} initial={initial.pack} blank="(none: the product's own surface coefficient)" />
      <Select name="limitsId" label="Limit set" options={limits} state={state} initial={initial.limits} />
      <Select
        name="model"
        label="Model"
        initial={initial.model}
        options={[
          { id: "auto", label: "auto: lumped when Bi < 0.1 and no freezing range is crossed, else conduction" },
          { id: "lumped", label: "lumped capacitance" },
          { id: "conduction", label: "conduction (3-D box, r–z cylinder, 1-D slab and sphere)" },
          { id: "conduction-1d", label: "1-D conduction shortcut" },
        ]}
        state={state}
      />
      <details>
        <summary>Judge only part of the trace (optional)</summary>
        <p className="hint muted">Times in UTC. The model still runs from the first sample, so the product enters the window with its history.</p>
        <Field name="windowStart" label="From (UTC)" type="datetime-local" step={60} state={state} />
        <Field name="windowEnd" label="To (UTC)" type="datetime-local" step={60} state={state} />
      </details>
      <details open={Boolean(state.values?.uncertainty)}>
        <summary>Propagate input uncertainty (optional)</summary>
        <p className="hint muted">
          JSON: inputs by path (product.… or pack.…, list indices from 0), ± as a half-width (uniform) or one standard deviation (normal), in percent when
          &quot;percent&quot; is true; a seeded Monte Carlo run gives a 5–95 % core band and how often each rule fails. With &quot;use_in_guard_band&quot;, the band&apos;s
          half-width widens the guard band of the rules on predicted channels.
        </p>
        <textarea
          name="uncertainty"
          rows={5}
          style={{ width: "100%", fontFamily: "monospace" }}
          defaultValue={state.values?.uncertainty}
          placeholder={'{"inputs": [{"path": "product.h_W_m2K", "plusminus": 20, "percent": true, "distribution": "normal"}], "samples": 500, "seed": 1, "use_in_guard_band": true}'}
          data-testid="uncertainty-json"
        />
        {Object.entries(state.fieldErrors ?? {}).filter(([k]) => k.startsWith("uncertainty")).map(([k, m]) => (
          <span key={k} className="field-error" data-testid="error-uncertainty">{k}: {m}</span>
        ))}
      </details>
      <details open={["air", "surface", "mean", "probe"].some((c) => state.values?.[`cc-${c}`] === "on")}>
        <summary>Growth and shelf life on other channels (optional)</summary>
        <p className="hint muted">The product&apos;s growth and shelf-life models always run on the predicted core; tick a channel to see them there too (the air for comparison; the product probe when the trace has one).</p>
        <div style={{ display: "flex", gap: "1rem" }}>
          {(["air", "surface", "mean", "probe"] as const).map((c) => (
            <label key={c} style={{ fontWeight: 400 }}>
              <input type="checkbox" name={`cc-${c}`} defaultChecked={state.values?.[`cc-${c}`] === "on"} data-testid={`cc-${c}`} /> {c}
            </label>
          ))}
        </div>
        {state.fieldErrors?.consequenceChannels && <span className="field-error" data-testid="error-consequence-channels">{state.fieldErrors.consequenceChannels}</span>}
      </details>
      {state.fieldErrors?.correctsId && <p className="field-error">{state.fieldErrors.correctsId}</p>}
      <FormMessage state={state} />
      <button type="submit" disabled={pending}>{pending ? "Running…" : "Run review"}</button>
    </ActionForm>
  );
}
