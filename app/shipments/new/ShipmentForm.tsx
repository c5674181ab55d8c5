"use client";

import { useActionState, useState } from "react";
import { createShipmentAction } from "@/app/actions/shipments";
import { ActionForm } from "@/app/components/ActionForm";
import { Field, FormMessage } from "@/app/components/Field";
import type { FormState } from "@/lib/validation";

interface Option {
  id: string;
  label: string;
}
interface LoggerRow {
  position: string;
  serial: string;
  fileNamePattern: string;
  products: Array<{ productId: string; packId: string; governing: boolean }>;
}

const POSITIONS = ["front", "middle", "rear", "front top", "front bottom", "middle top", "middle bottom", "rear top", "rear bottom", "tote 1", "tote 2", "tote 3", "tote 4"];
const emptyRow = (productId = ""): LoggerRow => ({ position: "", serial: "", fileNamePattern: "", products: [{ productId, packId: "", governing: false }] });

/**
 * The shipment and its loggers. The logger rows are kept in state and posted as JSON (one hidden field);
 * after a refusal every field, rows included, stays as the user left it.
 */
export function ShipmentForm({ lanes, limits, products, packs }: { lanes: Option[]; limits: Option[]; products: Option[]; packs: Option[] }) {
  const [state, action, pending] = useActionState<FormState, FormData>(createShipmentAction, {});
  const [laneId, setLaneId] = useState(state.values?.laneId ?? (lanes[0]?.id ?? ""));
  const [rows, setRows] = useState<LoggerRow[]>([emptyRow(products[0]?.id)]);
  const set = (i: number, r: Partial<LoggerRow>) => setRows(rows.map((x, j) => (j === i ? { ...x, ...r } : x)));
  const setProduct = (i: number, k: number, p: Partial<LoggerRow["products"][number]>) => set(i, { products: rows[i]!.products.map((x, j) => (j === k ? { ...x, ...p } : x)) });
  const v = state.values ?? {};
  const payload = rows.map((r) => ({ position: r.position, serial: r.serial || undefined, fileNamePattern: r.fileNamePattern || undefined, products: r.products.map((p) => ({ productId: p.productId, packId: p.packId || undefined, governing: p.governing || undefined })) }));
  return (
    <ActionForm action={action} className="stack" aria-label="New shipment">
      <div className="grid2">
        <Field name="reference" label="Reference" hint="Your shipment or trip number" state={state} />
        <label htmlFor="f-limitsId">
          Limit set
          <span className="hint">Every review of this shipment uses it</span>
          <select id="f-limitsId" name="limitsId" defaultValue={v.limitsId ?? limits[0]?.id}>
            {limits.map((o) => <option key={o.id} value={o.id}>{o.label}</option>)}
          </select>
          {state.fieldErrors?.limitsId && <span className="field-error" data-testid="error-limitsId">{state.fieldErrors.limitsId}</span>}
        </label>
        <label htmlFor="f-laneId">
          Lane
          <select id="f-laneId" name="laneId" value={laneId} onChange={(e) => setLaneId(e.target.value)}>
            {lanes.map((o) => <option key={o.id} value={o.id}>{o.label}</option>)}
            <option value="">a new lane…</option>
          </select>
        </label>
        {laneId === "" && (
          <fieldset className="grid2" style={{ border: 0, padding: 0 }}>
            <Field name="newLaneName" label="New lane: name" state={state} />
            <Field name="newLaneOrigin" label="Origin" state={state} />
            <Field name="newLaneDestination" label="Destination" state={state} />
          </fieldset>
        )}
        <Field name="carrier" label="Carrier" state={state} />
        <Field name="vehicle" label="Vehicle" hint="Truck, trailer or container number" state={state} />
        <Field name="plannedDepartureAt" label="Planned departure (UTC)" type="datetime-local" state={state} />
        <Field name="plannedArrivalAt" label="Planned arrival (UTC)" type="datetime-local" state={state} />
        <Field name="actualDepartureAt" label="Actual departure (UTC)" hint="Loggers' calibration is judged on this date" type="datetime-local" state={state} />
        <Field name="actualArrivalAt" label="Actual arrival (UTC)" type="datetime-local" state={state} />
      </div>
      <label htmlFor="f-notes">Notes<textarea id="f-notes" name="notes" rows={2} defaultValue={v.notes} /></label>
      <h2>Loggers</h2>
      <datalist id="positions">{POSITIONS.map((p) => <option key={p} value={p} />)}</datalist>
      {rows.map((r, i) => (
        <fieldset key={i} className="card" data-testid="logger-row">
          <legend>Logger {i + 1}</legend>
          <div className="grid2">
            <label>Position in the load<input list="positions" value={r.position} onChange={(e) => set(i, { position: e.target.value })} data-testid={`position-${i}`} /></label>
            <label>Serial (matches the file&apos;s metadata)<input value={r.serial} onChange={(e) => set(i, { serial: e.target.value })} data-testid={`serial-${i}`} /></label>
            <label>or file-name pattern (* and ?)<input value={r.fileNamePattern} placeholder="*tote3*.csv" onChange={(e) => set(i, { fileNamePattern: e.target.value })} /></label>
          </div>
          {r.products.map((p, k) => (
            <div key={k} className="grid2">
              <label>Product<select value={p.productId} onChange={(e) => setProduct(i, k, { productId: e.target.value })} data-testid={`product-${i}-${k}`}>
                <option value="">choose…</option>
                {products.map((o) => <option key={o.id} value={o.id}>{o.label}</option>)}
              </select></label>
              <label>Pack used<select value={p.packId} onChange={(e) => setProduct(i, k, { packId: e.target.value })}>
                <option value="">none (the product&apos;s own surface coefficient)</option>
                {packs.map((o) => <option key={o.id} value={o.id}>{o.label}</option>)}
              </select></label>
              <label style={{ display: "inline" }}><input type="checkbox" checked={p.governing} onChange={(e) => setProduct(i, k, { governing: e.target.checked })} /> this logger governs this product (else the worst of its loggers does)</label>
            </div>
          ))}
          <button type="button" className="secondary" onClick={() => set(i, { products: [...r.products, { productId: "", packId: "", governing: false }] })}>Add a product to this logger</button>{" "}
          {rows.length > 1 && <button type="button" className="secondary" onClick={() => setRows(rows.filter((_, j) => j !== i))}>Remove this logger</button>}
        </fieldset>
      ))}
      <p><button type="button" className="secondary" onClick={() => setRows([...rows, emptyRow(rows[rows.length - 1]?.products[0]?.productId)])} data-testid="add-logger">Add a logger</button></p>
      {state.fieldErrors?.loggers && <p className="field-error" data-testid="error-loggers">{state.fieldErrors.loggers}</p>}
      <input type="hidden" name="loggers" value={JSON.stringify(payload)} />
      <FormMessage state={state} />
      <button type="submit" disabled={pending} data-testid="create-shipment">{pending ? "Saving…" : "Create the shipment"}</button>
    </ActionForm>
  );
}
