import Link from "next/link";
import { WriteGate } from "@/app/components/WriteGate";
import { searchTraces } from "@/lib/db/traces";
import { Pager, SearchBox } from "@/app/components/Pager";
import { listParamsSchema, nonEmpty } from "@/app/components/listParams";
import { TraceUploader } from "./TraceUploader";
import { displayZone } from "@/app/displayZone";
import { formatSpan } from "@/lib/display/time";

export const dynamic = "force-dynamic";

export default async function TracesPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const p = listParamsSchema.parse(nonEmpty(await searchParams));
  const [traces, zone] = await Promise.all([searchTraces({ q: p.q, page: p.page }), displayZone()]);
  const params = { q: p.q };
  return (
    <>
      <h1>Traces</h1>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Upload a logger file</h2>
        <WriteGate permission="trace:import"><TraceUploader /></WriteGate>
      </section>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Stored traces</h2>
        <SearchBox params={params} q={p.q} label="Search traces" placeholder="name, file name, SHA-256 or id" />
        <Pager path="/traces" params={params} page={traces.page} pages={traces.pages} total={traces.total} pageSize={traces.pageSize} noun="traces" />
        {traces.rows.length === 0 ? (
          <p className="muted">{p.q ? "No traces match." : "No traces yet."}</p>
        ) : (
          <table data-testid="trace-list">
            <thead>
              <tr><th>Name</th><th>File</th><th className="num">Samples</th><th>Recorded</th><th>Channels</th><th>Warnings</th><th>Reviews</th></tr>
            </thead>
            <tbody>
              {traces.rows.map((t) => (
                <tr key={t.id}>
                  <td><Link href={`/traces/${t.id}`}>{t.name}</Link></td>
                  <td>{t.fileName}</td>
                  <td className="num">{t.sampleCount}</td>
                  <td>{formatSpan(t.startAt, t.endAt, zone)}</td>
                  <td>{t.hasProbe ? "air + product probe" : "air"}</td>
                  <td>{t.warnings.length || ""}</td>
                  <td>{t.reviewCount > 0 ? t.reviewCount : <Link href={`/reviews/new?trace=${t.id}`} className="status-hold">never reviewed</Link>}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        <Pager path="/traces" params={params} page={traces.page} pages={traces.pages} total={traces.total} pageSize={traces.pageSize} noun="traces" />
      </section>
    </>
  );
}
