import Link from "next/link";
import { WriteGate } from "@/app/components/WriteGate";
import { getDefinition, listLatestDefinitions } from "@/lib/db/definitions";
import type { Pack } from "@/lib/thermal/definitions";
import { PackEditor } from "./PackEditor";
import { sigTrim } from "@/lib/display/numbers";

export const dynamic = "force-dynamic";

export default async function PacksPage({ searchParams }: { searchParams: Promise<{ saved?: string; edit?: string }> }) {
  const { saved, edit } = await searchParams;
  const packs = await listLatestDefinitions<Pack>("pack");
  const editing = edit ? await getDefinition<Pack>(edit) : null;
  return (
    <>
      <h1>Packs</h1>
      <p className="muted">A pack is what stands between the air and the product: films, insulation layers, and coolant. A bare product needs none.</p>
      {saved && <p className="muted" data-testid="saved-note">Pack saved.</p>}
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Stored packs</h2>
        {packs.length === 0 ? <p className="muted">No packs yet.</p> : (
          <table data-testid="pack-list">
            <thead><tr><th>Name</th><th className="num">Version</th><th>Layers</th><th>Coolant</th><th /></tr></thead>
            <tbody>
              {packs.map((p) => (
                <tr key={p.id}>
                  <td>{p.name}</td>
                  <td className="num">{p.version}</td>
                  <td>{p.body.layers.map((l) => `${l.name} ${sigTrim(l.thickness_m * 1000, 3)} mm`).join(", ") || "none"}</td>
                  <td>{p.body.coolants.map((c) => `${c.name} ${sigTrim(c.mass_kg, 3)} kg`).join(", ") || "none"}</td>
                  <td><Link href={`/packs?edit=${p.id}`}>Edit</Link></td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>{editing ? `Edit ${editing.name}` : "Define a pack"}</h2>
        <WriteGate permission="definition:edit"><PackEditor key={editing?.id ?? "new"} editing={editing && editing.kind === "pack" ? { id: editing.id, lineage: editing.lineage, version: editing.version, body: editing.body } : undefined} /></WriteGate>
      </section>
    </>
  );
}
