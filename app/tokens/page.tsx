import Link from "next/link";
import { pageActor, can } from "@/app/guard";
import { listTokens } from "@/lib/services/apiTokens";
import { users } from "@/lib/services/users";
import { listMonitors } from "@/lib/db/monitors";
import { formatTime } from "@/lib/display/time";
import { displayZone } from "@/app/displayZone";
import { CreateTokenForm, RevokeTokenButton } from "./TokenForms";

export const dynamic = "force-dynamic";

/** API tokens: an administrator lists, creates (shown once) and revokes them. */
export default async function TokensPage() {
  const actor = await pageActor();
  if (!can(actor, "user:admin")) {
    return (
      <>
        <h1>API tokens</h1>
        <p className="form-error" data-testid="refused">Only an administrator manages API tokens. Your own tokens are made by an administrator, or with <code>corelag token create</code> on the server.</p>
      </>
    );
  }
  const zone = await displayZone();
  const listed = await listTokens({ includeRevoked: true });
  const tokens = listed.ok ? listed.tokens : [];
  const people = (await users()).filter((u) => !u.disabled);
  const openMonitors = (await listMonitors()).filter((m) => m.status === "open");
  const when = (iso: string | null, none: string) => (iso ? formatTime(new Date(iso), zone) : none);
  return (
    <>
      <h1>API tokens</h1>
      <p>
        Tokens let other systems use the <Link href="/api-docs">HTTP API</Link>. A token acts with its owner&apos;s role, narrowed by its scope: <strong>read</strong> only
        reads, <strong>write</strong> does what the owner&apos;s role allows, <strong>device</strong> only posts readings, to the monitor it is bound to (each monitor is made with one). Only a token&apos;s SHA-256 is stored: it is shown once, when made.
      </p>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>New token</h2>
        <CreateTokenForm owners={people.map((u) => ({ email: u.email, label: `${u.name} <${u.email}> (${u.role})` }))} monitors={openMonitors.map((m) => ({ id: m.id, label: `${m.name}${m.serial ? ` (logger ${m.serial})` : ""}` }))} />
      </section>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Tokens</h2>
        {tokens.length === 0 ? (
          <p className="muted">No tokens yet.</p>
        ) : (
          <table data-testid="tokens">
            <thead>
              <tr><th>Name</th><th>Token</th><th>Owner</th><th>Scope</th><th>Made</th><th>Expires</th><th>Last used</th><th>State</th><th></th></tr>
            </thead>
            <tbody>
              {tokens.map((t) => (
                <tr key={t.id}>
                  <td>{t.name}</td>
                  <td><code>{t.prefix}…</code></td>
                  <td>{t.owner.name} <span className="muted">({t.owner.role}{t.owner.disabled ? ", disabled" : ""})</span></td>
                  <td>{t.scope}{t.monitor_id ? <> · <Link href={`/monitors/${t.monitor_id}`}>its monitor</Link></> : null}</td>
                  <td>{when(t.created_at, "")}</td>
                  <td>{when(t.expires_at, "never")}</td>
                  <td>{when(t.last_used_at, "not yet")}</td>
                  <td>{t.state === "active" ? "active" : t.state === "expired" ? "expired" : `revoked ${when(t.revoked_at, "")}`}</td>
                  <td>{t.state === "active" ? <RevokeTokenButton id={t.id} name={t.name} /> : null}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
    </>
  );
}
