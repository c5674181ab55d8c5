import Link from "next/link";
import { listAudit } from "@/lib/db/audit";
import { verifyAuditChain } from "@/lib/review/audit";

export const dynamic = "force-dynamic";

export default async function AuditPage() {
  const entries = await listAudit();
  const check = verifyAuditChain(entries);
  const link = (e: (typeof entries)[number]) => (e.entity === "review" ? <Link href={`/reviews/${e.entityId}`}>{e.entityId}</Link> : e.entity === "trace" ? <Link href={`/traces/${e.entityId}`}>{e.entityId}</Link> : e.entityId);
  return (
    <>
      <h1>Audit log</h1>
      <section className="card">
        <p data-testid="chain-status" className={check.ok ? "status-pass" : "status-fail"}>
          {check.ok ? `Hash chain intact: ${check.entries} entries.` : `Hash chain broken: ${check.problems.join("; ")}`}
        </p>
        <p className="muted">Each entry carries the SHA-256 of the one before it; the database refuses edits and deletions. <code>npm run -s corelag -- verify</code> also re-runs every stored review to confirm that it reproduces bit for bit.</p>
        <table>
          <thead><tr><th className="num">#</th><th>When (UTC)</th><th>Action</th><th>Record</th><th>By</th><th>Hash</th></tr></thead>
          <tbody>
            {[...entries].reverse().map((e) => (
              <tr key={e.seq}>
                <td className="num">{e.seq}</td>
                <td>{e.at.toISOString().slice(0, 19).replace("T", " ")}</td>
                <td>{e.action}</td>
                <td>{e.entity} {link(e)}</td>
                <td>{e.actor}</td>
                <td><code className="hash">{e.hash.slice(0, 16)}…</code></td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
    </>
  );
}
