import Link from "next/link";
import { queryAudit, auditHead, auditEntityWord, AUDIT_ACTIONS, AUDIT_ENTITIES } from "@/lib/db/auditQueries";
import { Pager } from "@/app/components/Pager";
import { auditFilter, auditQueryParams, parseAuditParams, unknownFilterMessage } from "./filters";
import { ChainCheck } from "./ChainCheck";
import { displayZone } from "@/app/displayZone";
import { formatTime, zoneLabel } from "@/lib/display/time";
import { auditSummary } from "@/lib/review/auditSummary";
import { HashText } from "@/app/components/HashText";

export const dynamic = "force-dynamic";

export default async function AuditPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const raw = await searchParams;
  const p = parseAuditParams(raw);
  const zone = await displayZone();
  const refused = p.unknown.length > 0;
  // a filter naming an unknown kind or action shows nothing (never every entry as if it matched)
  const empty = { rows: [], total: 0, page: 1, pages: 1, pageSize: 1 };
  const [list, head] = await Promise.all([refused ? empty : queryAudit({ ...auditFilter(p, zone), page: p.page }), auditHead()]);
  const params = auditQueryParams(p);
  const csv = new URLSearchParams(Object.entries(params).filter((e): e is [string, string] => !!e[1])).toString();
  const filtered = refused || Object.values(params).some(Boolean);
  return (
    <>
      <h1>Audit log</h1>
      <section className="card">
        <ChainCheck head={head} verify={raw.verify === "1"} zone={zone} />
      </section>
      <section className="card">
        <form className="filters no-print" aria-label="Filter the audit log" data-testid="audit-filters">
          <label>Kind of record
            <select name="entity" defaultValue={p.entity ?? ""} data-testid="filter-entity">
              <option value="">any</option>
              {AUDIT_ENTITIES.map((k) => <option key={k} value={k}>{auditEntityWord(k)}</option>)}
            </select>
          </label>
          <label>Action
            <select name="action" defaultValue={p.action ?? ""} data-testid="filter-action">
              <option value="">any</option>
              {AUDIT_ACTIONS.map((a) => <option key={a} value={a}>{a}</option>)}
            </select>
          </label>
          <label>Object id <input name="object" defaultValue={p.object} size={26} placeholder="exact id" data-testid="filter-object" /></label>
          <label>From (day, {zoneLabel(Date.now(), zone)}) <input type="date" name="from" defaultValue={p.from} data-testid="filter-from" /></label>
          <label>to (inclusive) <input type="date" name="to" defaultValue={p.to} data-testid="filter-to" /></label>
          <label>Search <input type="search" name="q" defaultValue={p.q} maxLength={100} placeholder="name, title, id, hash, who" size={28} data-testid="search-input" /></label>
          <button type="submit" className="secondary">Show</button>
          {filtered && <Link href="/audit">Clear</Link>}
        </form>
        {refused && <p className="form-error" data-testid="audit-filter-unknown">{unknownFilterMessage(p.unknown)}</p>}
        {!refused && <p className="no-print">
          <a href={`/audit/export.csv${csv ? `?${csv}` : ""}`} data-testid="audit-csv" download>Export {filtered ? "these entries" : "the whole log"} as CSV</a>
          <span className="muted"> (every matching entry, oldest first, with names, links, details and hashes; formula-like cells neutralised)</span>
        </p>}
        {!refused && <Pager path="/audit" params={params} page={list.page} pages={list.pages} total={list.total} pageSize={list.pageSize} noun="entries" />}
        {list.rows.length > 0 && (
          <div className="table-scroll">
          <table data-testid="audit-table" className="audit-table">
            <thead><tr><th className="num">#</th><th>When</th><th>Action</th><th>Record</th><th>By</th><th>Details</th><th>Hash</th></tr></thead>
            <tbody>
              {list.rows.map((e) => (
                <tr key={e.seq} data-testid={`audit-row-${e.seq}`}>
                  <td className="num">{e.seq}</td>
                  <td style={{ whiteSpace: "nowrap" }}>{formatTime(e.at, zone, { seconds: true })}</td>
                  <td>{e.action}{e.format && <> <span data-testid="audit-format">({e.format})</span></>}{e.action === "verify" && e.entity === "chain" && <> <strong className={(e.details as { ok?: boolean }).ok ? "status-pass" : "status-fail"}>{(e.details as { ok?: boolean }).ok ? "chain intact" : "problems found"}</strong></>}{e.action === "verify" && e.entity !== "chain" && <> <strong className={(e.details as { reproduced?: boolean }).reproduced ? "status-pass" : "status-fail"}>{(e.details as { reproduced?: boolean }).reproduced ? "reproduced" : "did not reproduce"}</strong></>}</td>
                  <td>
                    {e.entity === "chain" ? (
                      <>audit chain: entries 1–{e.entityId} checked in full</>
                    ) : (
                      <>
                        {e.entity === "key" ? "" : <>{auditEntityWord(e.entity)}{e.subject.kind ? ` (${e.subject.kind})` : ""}:{" "}</>}
                        {e.subject.href && e.subject.name ? <Link href={e.subject.href} data-testid="audit-subject">{e.subject.name}</Link> : e.subject.name ?? <span className="muted">not found</span>}
                        <div className="raw-id"><Link href={`/audit?object=${e.entityId}`} title="every entry for this object">{e.entityId}</Link></div>
                      </>
                    )}
                  </td>
                  <td>{e.actor}</td>
                  <td><span data-testid="audit-summary">{auditSummary(e.action, e.details)}</span><details><summary>all details</summary><pre style={{ whiteSpace: "pre-wrap", fontSize: "0.78rem", margin: 0 }}>{JSON.stringify(e.details, null, 1)}</pre></details></td>
                  <td><HashText hash={e.hash} title={`${e.hash}\nprevious ${e.prevHash}`} shown={10} testId="audit-hash" /></td>
                </tr>
              ))}
            </tbody>
          </table>
          </div>
        )}
        {list.rows.length === 0 && !refused && <p className="muted">No entries match.</p>}
        {!refused && <Pager path="/audit" params={params} page={list.page} pages={list.pages} total={list.total} pageSize={list.pageSize} noun="entries" />}
      </section>
    </>
  );
}
