import Link from "next/link";
import { WriteGate } from "@/app/components/WriteGate";
import { getDefinition, listLatestDefinitions } from "@/lib/db/definitions";
import type { LimitSet } from "@/lib/exposure/limits";
import { LIMIT_TEMPLATES } from "@/lib/exposure/templates";
import { LimitSetEditor } from "./LimitSetEditor";
import { describeRule } from "@/lib/review/parameters";

export const dynamic = "force-dynamic";

export default async function LimitsPage({ searchParams }: { searchParams: Promise<{ saved?: string; edit?: string }> }) {
  const { saved, edit } = await searchParams;
  const sets = await listLatestDefinitions<LimitSet>("limits");
  const editing = edit ? await getDefinition<LimitSet>(edit) : null;
  return (
    <>
      <h1>Limit sets</h1>
      {saved && <p className="muted" data-testid="saved-note">Limit set saved.</p>}
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Stored limit sets</h2>
        {sets.length === 0 ? <p className="muted">No limit sets yet.</p> : (
          <table data-testid="limits-list">
            <thead><tr><th>Name</th><th className="num">Version</th><th>Rules</th><th className="num">Sensor ± K</th><th /></tr></thead>
            <tbody>
              {sets.map((s) => (
                <tr key={s.id}>
                  <td>{s.name}</td>
                  <td className="num">{s.version}</td>
                  <td><ul style={{ margin: 0, paddingLeft: "1rem" }}>{s.body.rules.map((r) => <li key={r.id}><strong>{r.id}</strong>: {describeRule(r)}</li>)}</ul></td>
                  <td className="num">{s.body.sensor_accuracy_K ?? 0}</td>
                  <td><Link href={`/limits?edit=${s.id}`}>Edit</Link></td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>{editing ? `Edit ${editing.name}` : "New limit set"}</h2>
        <WriteGate permission="definition:edit">
        <LimitSetEditor
          key={editing?.id ?? "new"}
          templates={LIMIT_TEMPLATES}
          editing={editing && editing.kind === "limits" ? { id: editing.id, lineage: editing.lineage, version: editing.version, body: editing.body } : undefined}
        />
        </WriteGate>
      </section>
    </>
  );
}
