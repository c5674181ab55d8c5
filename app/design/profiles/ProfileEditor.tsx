"use client";

import { ActionForm } from "@/app/components/ActionForm";
import { useActionState, useMemo, useState } from "react";
import { saveProfile } from "@/app/actions/definitions";
import { DefinitionFooter } from "@/app/components/DefinitionFooter";
import { num } from "@/app/components/NumberField";
import { profileSchema, profileSeries, type Profile } from "@/lib/design/profile";
import { TemperatureChart } from "@/app/components/TemperatureChart";
import type { FormState } from "@/lib/validation";

interface Row { kind: "hold" | "ramp"; C: string; minutes: string }

/** Builds a profile from hold and ramp rows, repeated as a block; shows it as it will be sampled. */
export function ProfileEditor({ examples, editing }: { examples: readonly Profile[]; editing?: { id: string; lineage: string; version: number; body: Profile } }) {
  const [state, action, pending] = useActionState<FormState, FormData>(saveProfile, {});
  const [name, setName] = useState("");
  const [initial, setInitial] = useState("4");
  const [repeat, setRepeat] = useState("1");
  const [rows, setRows] = useState<Row[]>([{ kind: "hold", C: "4", minutes: "120" }, { kind: "ramp", C: "25", minutes: "30" }, { kind: "hold", C: "25", minutes: "90" }]);
  // A stored or example profile is edited as JSON (it may nest repeats that the rows cannot show).
  const [json, setJson] = useState<string | null>(editing ? JSON.stringify(editing.body, null, 2) : null);
  const def = useMemo(() => {
    if (json !== null) {
      try {
        return JSON.parse(json) as unknown;
      } catch {
        return { error: "the JSON cannot be read" };
      }
    }
    const segs = rows.map((r) => (r.kind === "hold" ? { kind: "hold", C: num(r.C) ?? null, duration_min: num(r.minutes) ?? null } : { kind: "ramp", to_C: num(r.C) ?? null, duration_min: num(r.minutes) ?? null }));
    const count = num(repeat) ?? 1;
    return { name, initial_C: num(initial) ?? null, segments: count > 1 ? [{ kind: "repeat", count, segments: segs }] : segs };
  }, [json, rows, name, initial, repeat]);
  const parsed = profileSchema.safeParse(def);
  const series = parsed.success ? (() => { try { return profileSeries(parsed.data); } catch { return null; } })() : null;
  const set = (i: number, patch: Partial<Row>) => setRows(rows.map((r, j) => (j === i ? { ...r, ...patch } : r)));
  return (
    <ActionForm action={action} className="stack" style={{ maxWidth: "none" }} aria-label="Profile">
      {editing ? (
        <p className="muted">Editing version {editing.version}: saving creates version {editing.version + 1}.</p>
      ) : (
        <label>Start from an example
          <select onChange={(e) => { const ex = examples[Number(e.target.value)]; setJson(ex ? JSON.stringify(ex, null, 2) : null); }} defaultValue="" data-testid="profile-example">
            <option value="">(build below)</option>
            {examples.map((p, i) => <option key={p.name} value={i}>{p.name}</option>)}
          </select>
        </label>
      )}
      {json !== null && (
        <label>Profile (JSON: name, start, interval_s, initial_C, segments of hold / ramp / repeat)
          <textarea rows={12} value={json} onChange={(e) => setJson(e.target.value)} style={{ fontFamily: "monospace" }} data-testid="profile-json" />
        </label>
      )}
      {json === null && (
        <>
          <label>Name<input value={name} onChange={(e) => setName(e.target.value)} data-testid="profile-name" /></label>
          <label>Air temperature at the start (°C)<input value={initial} onChange={(e) => setInitial(e.target.value)} size={6} /></label>
          <table>
            <thead><tr><th>Segment</th><th>°C (hold at / ramp to)</th><th>Minutes</th><th /></tr></thead>
            <tbody>
              {rows.map((r, i) => (
                <tr key={i}>
                  <td><select aria-label={`segment ${i + 1} kind`} value={r.kind} onChange={(e) => set(i, { kind: e.target.value as Row["kind"] })}><option value="hold">hold</option><option value="ramp">ramp</option></select></td>
                  <td><input aria-label={`segment ${i + 1} temperature`} value={r.C} size={6} onChange={(e) => set(i, { C: e.target.value })} /></td>
                  <td><input aria-label={`segment ${i + 1} minutes`} value={r.minutes} size={6} onChange={(e) => set(i, { minutes: e.target.value })} /></td>
                  <td><button type="button" className="secondary" onClick={() => setRows(rows.filter((_, j) => j !== i))} disabled={rows.length === 1}>Remove</button></td>
                </tr>
              ))}
            </tbody>
          </table>
          <button type="button" className="secondary" onClick={() => setRows([...rows, { kind: "hold", C: "4", minutes: "60" }])}>Add a segment</button>
          <label>Repeat the segments (times)<input value={repeat} onChange={(e) => setRepeat(e.target.value)} size={4} /></label>
        </>
      )}
      {!parsed.success && <p className="field-error" data-testid="profile-error">{parsed.error.issues[0]!.path.join(".") || "profile"}: {parsed.error.issues[0]!.message}</p>}
      {series && (
        <TemperatureChart title="Profile preview" height={200} times_ms={Array.from(series.t_s, (t) => t * 1000)} lines={[{ label: `Air (${series.t_s.length.toLocaleString("en")} samples)`, color: "var(--air)", values: Array.from(series.air_C) }]} />
      )}
      {Object.entries(state.fieldErrors ?? {}).map(([k, m]) => <p key={k} className="field-error" data-testid="server-error">{k}: {m}</p>)}
      <DefinitionFooter definition={def} editing={editing} state={state} pending={pending} noun="profile" />
    </ActionForm>
  );
}
