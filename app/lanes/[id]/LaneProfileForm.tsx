"use client";

import { useActionState } from "react";
import * as d3 from "d3";
import { laneProfileAction, type ProfilePreviewState } from "@/app/actions/shipments";
import { ActionForm } from "@/app/components/ActionForm";
import { Field, FormMessage } from "@/app/components/Field";

const W = 960, H = 320;
const M = { top: 10, right: 20, bottom: 30, left: 46 };

function EnvelopeChart({ p }: { p: NonNullable<ProfilePreviewState["preview"]> }) {
  const x = d3.scaleLinear().domain(d3.extent(p.offset_min) as [number, number]).range([M.left, W - M.right]);
  const all = [...p.min_C, ...p.max_C];
  const y = d3.scaleLinear().domain([Math.min(...all) - 0.5, Math.max(...all) + 0.5]).nice().range([H - M.bottom, M.top]);
  const line = d3.line<number>().x((_, i) => x(p.offset_min[i]!)).y((v) => y(v));
  const area = d3.area<number>().x((i) => x(p.offset_min[i]!)).y0((i) => y(p.min_C[i]!)).y1((i) => y(p.max_C[i]!))(p.offset_min.map((_, i) => i)) ?? "";
  return (
    <figure className="chart" data-testid="envelope-chart" style={{ margin: 0 }}>
      <svg viewBox={`0 0 ${W} ${H}`} role="img" aria-label="Envelope of the traces and the profile">
        <path d={area} fill="#1f5fa8" fillOpacity={0.12} />
        {p.traces_C.map((t, i) => <path key={i} d={line(t) ?? ""} fill="none" stroke="#8a94a3" strokeWidth={0.8} strokeOpacity={0.6} />)}
        <path d={line(p.profile_C) ?? ""} fill="none" stroke="#b5551d" strokeWidth={2.2} data-testid="profile-line" />
        {y.ticks(5).map((t) => <text key={t} x={M.left - 6} y={y(t)} dy="0.32em" textAnchor="end" fontSize={11} fill="#5b6575">{t}</text>)}
        {d3.ticks(x.domain()[0]! / 60, x.domain()[1]! / 60, 8).map((h) => <text key={h} x={x(h * 60)} y={H - 10} textAnchor="middle" fontSize={11} fill="#5b6575">{h} h</text>)}
      </svg>
      <figcaption className="legend">shaded: range of all {p.traces_C.length} traces · grey: each trace · orange: the profile (percentile per step{p.profile_C.some((v, i) => v !== p.percentile_C[i]) ? ", smoothed" : ""}) · °C against hours since departure (or since midnight)</figcaption>
    </figure>
  );
}

export function LaneProfileForm({ laneId, shipments, positions }: { laneId: string; shipments: Array<{ id: string; label: string }>; positions: string[] }) {
  const [state, action, pending] = useActionState<ProfilePreviewState, FormData>(laneProfileAction, {});
  const v = state.values ?? {};
  return (
    <>
    <ActionForm action={action} className="stack" aria-label="Design profile from history">
      <input type="hidden" name="laneId" value={laneId} />
      <fieldset style={{ border: 0, padding: 0 }}>
        <legend>Shipments</legend>
        {shipments.map((s) => (
          <label key={s.id} style={{ display: "block" }}><input type="checkbox" name="shipmentIds" value={s.id} defaultChecked /> {s.label}</label>
        ))}
        {state.fieldErrors?.shipmentIds && <span className="field-error">{state.fieldErrors.shipmentIds}</span>}
      </fieldset>
      <div className="grid2">
        <label>Position (optional)<select name="position" defaultValue={v.position ?? ""}><option value="">every logger</option>{positions.map((p) => <option key={p} value={p}>{p}</option>)}</select>
          {state.fieldErrors?.position && <span className="field-error" data-testid="error-position">{state.fieldErrors.position}</span>}</label>
        <label>Align<select name="align" defaultValue={v.align ?? "departure"}><option value="departure">by time since departure</option><option value="time-of-day">by time of day (UTC)</option></select></label>
        <Field name="percentile" label="Percentile per step" hint="e.g. 95" type="number" step="any" defaultValue="95" state={state} />
        <Field name="step_min" label="Step, min" type="number" step="any" defaultValue="15" state={state} />
        <Field name="smooth_steps" label="Smoothing, steps" hint="centred moving average over an odd number of steps; 1 = none" type="number" defaultValue="1" state={state} />
        <Field name="name" label="Profile name (optional)" state={state} />
      </div>
      <FormMessage state={state} />
      <p>
        <button type="submit" name="intent" value="show" disabled={pending} data-testid="show-profile">Show the envelope and profile</button>{" "}
        <button type="submit" name="intent" value="save" className="secondary" disabled={pending} data-testid="save-profile">Save as a profile</button>
      </p>
    </ActionForm>
      {state.preview && (
        <>
          <EnvelopeChart p={state.preview} />
          <p className="muted">From {state.preview.sources.length} trace(s): {state.preview.sources.map((s) => `${s.shipment} ${s.position} (${s.file})`).join("; ")}. The saved profile lists them, with each file&apos;s SHA-256.</p>
        </>
      )}
    </>
  );
}
