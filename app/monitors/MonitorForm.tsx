"use client";

import { useActionState } from "react";
import Link from "next/link";
import { ActionForm } from "@/app/components/ActionForm";
import { Field, FormMessage } from "@/app/components/Field";
import { createMonitorAction, type MonitorFormState } from "@/app/actions/monitors";

interface Option { id: string; label: string }

function Select({ name, label, options, state, blank }: { name: string; label: string; options: Option[]; state: MonitorFormState; blank?: string }) {
  const error = state.fieldErrors?.[name];
  return (
    <label htmlFor={`f-${name}`}>
      {label}
      <select id={`f-${name}`} name={name} defaultValue={state.values?.[name] ?? (blank !== undefined ? "" : options[0]?.id) ?? ""} aria-invalid={error ? true : undefined}>
        {blank !== undefined && <option value="">{blank}</option>}
        {blank === undefined && options.length === 0 && <option value="">(none stored yet)</option>}
        {options.map((o) => <option key={o.id} value={o.id}>{o.label}</option>)}
      </select>
      {error && <span className="field-error" data-testid={`error-${name}`}>{error}</span>}
    </label>
  );
}

export function MonitorForm({ products, packs, limits }: { products: Option[]; packs: Option[]; limits: Option[] }) {
  const [state, action] = useActionState<MonitorFormState, FormData>(createMonitorAction, {});
  if (state.created) {
    return (
      <div data-testid="monitor-created" className="stack" style={{ maxWidth: "none" }}>
        <p>
          Monitor <strong>{state.created.name}</strong> created. Its device token is shown <strong>this once</strong>: copy it into the logger or gateway now.
        </p>
        <code className="hash" data-testid="device-token" style={{ fontSize: "0.95rem" }}>{state.created.device_token}</code>
        <p className="muted">
          Send readings with <code>POST /api/v1/monitors/{state.created.id}/readings</code> and <code>Authorization: Bearer &lt;token&gt;</code>, or replay a file:
          <br />
          <code>npm run -s corelag -- simulate --monitor {state.created.id} --trace FILE --speed 600 --token &lt;token&gt;</code>
        </p>
        <p><Link href={`/monitors/${state.created.id}`} data-testid="open-monitor">Open the live page</Link></p>
      </div>
    );
  }
  return (
    <ActionForm action={action} className="stack" aria-label="Create a monitor">
      <Field name="name" label="Name" hint="e.g. 'Route 7, tote 3'" state={state} required />
      <Select name="productId" label="Product" options={products} state={state} />
      <Select name="packId" label="Pack" options={packs} state={state} blank="(none: the product's own surface coefficient)" />
      <Select name="limitsId" label="Limit set" options={limits} state={state} />
      <Field name="shipmentId" label="Shipment (optional)" state={state} />
      <Field name="serial" label="Logger serial (optional)" state={state} />
      <Select name="model" label="Model" options={[{ id: "auto", label: "auto (as a review chooses)" }, { id: "lumped", label: "lumped capacitance" }, { id: "conduction", label: "conduction" }, { id: "conduction-1d", label: "1-D conduction shortcut" }]} state={state} />
      <Field name="leadMin" label="Alert lead, min" hint="alert when the limit is forecast within this many minutes" type="number" step="any" defaultValue="60" state={state} required />
      <fieldset>
        <legend>Forecast holds the air at</legend>
        <label><input type="radio" name="hold" value="current" defaultChecked={(state.values?.hold ?? "current") === "current"} /> the last reading</label>
        <label><input type="radio" name="hold" value="mean" defaultChecked={state.values?.hold === "mean"} /> the mean of the last readings</label>
        <Field name="holdLast" label="Readings in the mean" type="number" min={2} step={1} defaultValue="6" state={state} />
      </fieldset>
      <label htmlFor="f-webhooks">
        Webhooks (optional)
        <span className="hint">one http(s) URL per line; each alert is POSTed as JSON signed with HMAC-SHA256 (the secret is on the monitor page)</span>
        <textarea id="f-webhooks" name="webhooks" rows={2} defaultValue={state.values?.webhooks} aria-invalid={state.fieldErrors?.webhooks ? true : undefined} />
        {state.fieldErrors?.webhooks && <span className="field-error" data-testid="error-webhooks">{state.fieldErrors.webhooks}</span>}
      </label>
      <label htmlFor="f-emails">
        E-mails (optional)
        <span className="hint">one address per line; sent when the server has SMTP configured (CORELAG_SMTP_URL)</span>
        <textarea id="f-emails" name="emails" rows={2} defaultValue={state.values?.emails} aria-invalid={state.fieldErrors?.emails ? true : undefined} />
        {state.fieldErrors?.emails && <span className="field-error" data-testid="error-emails">{state.fieldErrors.emails}</span>}
      </label>
      <FormMessage state={state} />
      <button type="submit">Create monitor</button>
    </ActionForm>
  );
}
