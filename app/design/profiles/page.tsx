import Link from "next/link";
import { WriteGate } from "@/app/components/WriteGate";
import { getDefinition, listLatestDefinitions } from "@/lib/db/definitions";
import { EXAMPLE_PROFILES, profileSeries, profileSchema, type Profile } from "@/lib/design/profile";
import { readableDuration } from "@/lib/thermal/screening";
import { ProfileEditor } from "./ProfileEditor";

export const dynamic = "force-dynamic";

export default async function ProfilesPage({ searchParams }: { searchParams: Promise<{ saved?: string; edit?: string }> }) {
  const { saved, edit } = await searchParams;
  const profiles = await listLatestDefinitions<Profile>("profile");
  const editing = edit ? await getDefinition<Profile>(edit) : null;
  return (
    <>
      <h1>Design ambient profiles</h1>
      <p className="muted">A profile is the air a pack must survive, built from segments; a stored trace can serve as a profile too. The examples are scenarios of our own, not standards.</p>
      {saved && <p className="muted" data-testid="saved-note">Profile saved.</p>}
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Stored profiles</h2>
        {profiles.length === 0 ? <p className="muted">No profiles yet.</p> : (
          <table data-testid="profile-list">
            <thead><tr><th>Name</th><th className="num">Version</th><th>Length</th><th className="num">Samples</th><th className="num">Max °C</th><th /></tr></thead>
            <tbody>
              {profiles.map((p) => {
                const ok = profileSchema.safeParse(p.body);
                const s = ok.success ? profileSeries(ok.data) : null;
                return (
                  <tr key={p.id}>
                    <td>{p.name}</td><td className="num">{p.version}</td>
                    <td>{s ? readableDuration(s.t_s[s.t_s.length - 1]! - s.t_s[0]!) : "invalid"}</td>
                    <td className="num">{s?.t_s.length ?? "–"}</td>
                    <td className="num">{s ? s.air_C.reduce((m, x) => Math.max(m, x), -Infinity).toFixed(1) : "–"}</td>
                    <td><Link href={`/design/profiles?edit=${p.id}`}>Edit</Link></td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        )}
      </section>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>{editing ? `Edit ${editing.name}` : "New profile"}</h2>
        <WriteGate permission="definition:edit">
        <ProfileEditor
          key={editing?.id ?? "new"}
          examples={EXAMPLE_PROFILES}
          editing={editing && editing.kind === "profile" ? { id: editing.id, lineage: editing.lineage, version: editing.version, body: editing.body } : undefined}
        />
        </WriteGate>
      </section>
    </>
  );
}
