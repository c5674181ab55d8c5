import Link from "next/link";
import { listTraces } from "@/lib/db/traces";
import { TraceUploader } from "./TraceUploader";

export const dynamic = "force-dynamic";

export default async function TracesPage() {
  const traces = await listTraces();
  return (
    <>
      <h1>Traces</h1>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Upload a logger file</h2>
        <TraceUploader />
      </section>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Stored traces</h2>
        {traces.length === 0 ? (
          <p className="muted">No traces yet.</p>
        ) : (
          <table>
            <thead>
              <tr><th>Name</th><th>File</th><th className="num">Samples</th><th>From (UTC)</th><th>To (UTC)</th><th>Channels</th><th>Warnings</th></tr>
            </thead>
            <tbody>
              {traces.map((t) => (
                <tr key={t.id}>
                  <td><Link href={`/traces/${t.id}`}>{t.name}</Link></td>
                  <td>{t.fileName}</td>
                  <td className="num">{t.sampleCount}</td>
                  <td>{t.startAt.toISOString().slice(0, 16).replace("T", " ")}</td>
                  <td>{t.endAt.toISOString().slice(0, 16).replace("T", " ")}</td>
                  <td>{t.hasProbe ? "air + product probe" : "air"}</td>
                  <td>{t.warnings.length || ""}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
    </>
  );
}
