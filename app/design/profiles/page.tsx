import { listLatestDefinitions } from "@/lib/db/definitions";
import { EXAMPLE_PROFILES, profileSeries, profileSchema, type Profile } from "@/lib/design/profile";
import { readableDuration } from "@/lib/thermal/screening";
import { ProfileEditor } from "./ProfileEditor";

export const dynamic = "force-dynamic";

export default async function ProfilesPage({ searchParams }: { searchParams: Promise<{ saved?: string }> }) {
  const { saved } = await searchParams;
  const profiles = await listLatestDefinitions<Profile>("profile");
  return (
    <>
      <h1>Design ambient profiles</h1>
      <p className="muted">A profile is the air a pack must survive, built from segments; a stored trace can serve as a profile too. The examples are scenarios of our own, not standards.</p>
      {saved && <p className="muted" data-testid="saved-note">Profile saved.</p>}
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Stored profiles</h2>
        {profiles.length === 0 ? <p className="muted">No profiles yet.</p> : (
          <table data-testid="profile-list">
            <thead><tr><th>Name</th><th className="num">Version</th><th>Length</th><th className="num">Samples</th><th className="num">Max °C</th></tr></thead>
            <tbody>
              {profiles.map((p) => {
                const ok = profileSchema.safeParse(p.body);
                const s = ok.success ? profileSeries(ok.data) : null;
                return (
                  <tr key={p.id}>
                    <td>{p.name}</td><td className="num">{p.version}</td>
                    <td>{s ? readableDuration(s.t_s[s.t_s.length - 1]! - s.t_s[0]!) : "invalid"}</td>
                    <td className="num">{s?.t_s.length ?? "–"}</td>
                    <td className="num">{s ? Math.max(...s.air_C).toFixed(1) : "–"}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        )}
      </section>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>New profile</h2>
        <ProfileEditor examples={EXAMPLE_PROFILES} />
      </section>
    </>
  );
}
