import Link from "next/link";
import { notFound } from "next/navigation";
import { getDefinition, definitionVersions } from "@/lib/db/definitions";
import { DefinitionParameters } from "@/app/components/DefinitionParameters";
import { displayZone } from "@/app/displayZone";
import { formatTime } from "@/lib/display/time";

export const dynamic = "force-dynamic";

const EDITOR: Record<string, string> = { product: "/products", pack: "/packs", limits: "/limits", profile: "/design/profiles" };

/** One stored definition version, read-only: what a review or an audit entry points at. */
export default async function DefinitionPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const def = await getDefinition(id);
  if (!def) notFound();
  const [versions, zone] = await Promise.all([definitionVersions(def.lineage), displayZone()]);
  const latest = versions[versions.length - 1];
  return (
    <>
      <h1>{def.name} (version {def.version})</h1>
      <section className="card">
        <p className="muted">Stored {formatTime(def.createdAt, zone)}. A stored version never changes; an edit adds a new version.</p>
        <DefinitionParameters def={def} link={false} />
        <h2>Versions</h2>
        <ul data-testid="definition-versions">
          {versions.map((v) => (
            <li key={v.id}>
              {v.id === def.id ? <strong>version {v.version}</strong> : <Link href={`/definitions/${v.id}`}>version {v.version}</Link>} · {v.name} · {formatTime(v.createdAt, zone)} · <code className="hash">{v.sha256.slice(0, 16)}…</code>
            </li>
          ))}
        </ul>
        <p className="no-print">
          <Link href={`/audit?object=${def.id}`}>Audit entries for this version</Link>
          {latest && EDITOR[def.kind] && <> · <Link href={`${EDITOR[def.kind]}?edit=${latest.id}`}>Edit the latest version</Link></>}
        </p>
      </section>
    </>
  );
}
