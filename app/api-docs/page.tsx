import Link from "next/link";
import { openApiDocument } from "@/lib/api/openapi";
import { apiView, type SchemaRow } from "@/lib/api/openapiView";
import { PROBLEM_KINDS, problemTypeUri, type ProblemKind } from "@/lib/api/problem";
import { health } from "@/lib/services/api";

export const dynamic = "force-dynamic";

/** Text with `code` spans, as the document's descriptions write them. */
function Text({ text }: { text: string }) {
  return <>{text.split("`").map((part, i) => (i % 2 === 1 ? <code key={i}>{part}</code> : part))}</>;
}

function Rows({ rows }: { rows: SchemaRow[] }) {
  if (rows.length === 0) return null;
  return (
    <table className="schema">
      <thead>
        <tr><th>Field</th><th>Type</th><th>Required</th><th>Limits</th><th>Description</th></tr>
      </thead>
      <tbody>
        {rows.map((r, i) => (
          <tr key={i}>
            <td style={{ paddingLeft: `${0.5 + Math.max(0, r.depth - 1) * 1.1}rem` }}><code>{r.path || "(body)"}</code></td>
            <td>{r.ref ? <a href={`#schema-${r.ref}`}>{r.type}</a> : r.type}</td>
            <td>{r.path ? (r.required ? "yes" : "no") : ""}</td>
            <td>{r.limits}</td>
            <td><Text text={r.description} /></td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** The OpenAPI document of /api/v1, rendered as a page (the same document /api/v1/openapi.json serves). */
export default function ApiDocsPage() {
  const view = apiView(openApiDocument(health().version) as unknown as Record<string, unknown>);
  return (
    <>
      <h1>{view.title} <span className="muted">v1 · {view.version}</span></h1>
      <section className="card">
        <p><Text text={view.description} /></p>
        <p>
          Machine-readable: <a href="/api/v1/openapi.json"><code>/api/v1/openapi.json</code></a> (OpenAPI 3.1). A token is created on the command
          line, shown once: <code>npm run -s corelag -- token create --user EMAIL --name NAME --scope read|write</code>. The README has a curl example for every endpoint.
        </p>
        <nav aria-label="Endpoints">
          {view.groups.map((g) => (
            <div key={g.tag}>
              <strong>{g.tag}</strong>:{" "}
              {g.operations.map((op, i) => (
                <span key={op.anchor}>
                  {i > 0 ? " · " : ""}
                  <a href={`#${op.anchor}`}><code>{op.method} {op.path.replace("/api/v1", "")}</code></a>
                </span>
              ))}
            </div>
          ))}
        </nav>
      </section>

      {view.groups.map((g) => (
        <section key={g.tag}>
          <h2 style={{ textTransform: "capitalize" }}>{g.tag}</h2>
          {g.operations.map((op) => (
            <section className="card api-op" key={op.anchor} id={op.anchor} data-testid="api-operation">
              <h3><span className={`method method-${op.method.toLowerCase()}`}>{op.method}</span> <code>{op.path}</code></h3>
              <p><strong>{op.summary}</strong></p>
              {op.description.split("\n\n").map((p, i) => <p key={i}><Text text={p} /></p>)}
              {op.parameters.length > 0 && (
                <>
                  <h4>Parameters</h4>
                  <table>
                    <thead><tr><th>Name</th><th>In</th><th>Type</th><th>Required</th><th>Limits</th><th>Description</th></tr></thead>
                    <tbody>
                      {op.parameters.map((p) => (
                        <tr key={`${p.in}-${p.name}`}><td><code>{p.name}</code></td><td>{p.in}</td><td>{p.type}</td><td>{p.required ? "yes" : "no"}</td><td>{p.limits}</td><td>{p.description}</td></tr>
                      ))}
                    </tbody>
                  </table>
                </>
              )}
              {op.body.map((b) => (
                <div key={b.contentType}>
                  <h4>Body <code>{b.contentType}</code></h4>
                  <Rows rows={b.rows} />
                </div>
              ))}
              <h4>Responses</h4>
              <table>
                <thead><tr><th>Status</th><th>Meaning</th><th>Body</th></tr></thead>
                <tbody>
                  {op.responses.map((r) => (
                    <tr key={r.status}>
                      <td className="num">{r.status}</td>
                      <td>{r.description}</td>
                      <td>
                        {r.contentType ? <code>{r.contentType}</code> : "none"}
                        {r.ref ? <> · <a href={`#schema-${r.ref}`}>{r.ref}</a></> : null}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </section>
          ))}
        </section>
      ))}

      <h2>Problems</h2>
      <section className="card">
        <p>Every error is <code>application/problem+json</code> (RFC 9457): <code>type</code>, <code>title</code>, <code>status</code>, <code>detail</code>, and where known the <code>field</code>, or the <code>row</code> and <code>column</code> of an uploaded file.</p>
        <table>
          <thead><tr><th>Status</th><th>type</th><th>Meaning</th></tr></thead>
          <tbody>
            {(Object.keys(PROBLEM_KINDS) as ProblemKind[]).map((k) => (
              <tr key={k} id={`problem-${k}`}><td className="num">{PROBLEM_KINDS[k].status}</td><td><code>{problemTypeUri(k)}</code></td><td>{PROBLEM_KINDS[k].about}</td></tr>
            ))}
          </tbody>
        </table>
      </section>

      <h2>Schemas</h2>
      {view.schemas.map((s) => (
        <section className="card" key={s.name} id={`schema-${s.name}`}>
          <h3>{s.name}</h3>
          {s.description && <p>{s.description}</p>}
          <Rows rows={s.rows} />
        </section>
      ))}
      <p className="muted"><Link href="/">Back to the reviews</Link></p>
    </>
  );
}
