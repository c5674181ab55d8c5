import Link from "next/link";
import { z } from "zod";
import { listReviews } from "@/lib/db/reviews";
import { listLatestDefinitions } from "@/lib/db/definitions";
import { StatusBadge } from "@/app/components/StatusBadge";
import { Caution } from "@/app/components/Caution";

export const dynamic = "force-dynamic";

const day = z.string().regex(/^\d{4}-\d{2}-\d{2}$/).optional().catch(undefined);
const filterSchema = z.object({
  outcome: z.enum(["accept", "hold", "reject"]).optional().catch(undefined),
  status: z.enum(["open", "signed"]).optional().catch(undefined),
  product: z.string().max(100).optional().catch(undefined),
  from: day,
  to: day,
});

export default async function HomePage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const raw = await searchParams;
  // Filters come from the address bar; unknown or malformed values are ignored (shown as "any").
  const f = filterSchema.parse(Object.fromEntries(Object.entries(raw).filter(([, v]) => v !== "")));
  const [reviews, all, products] = await Promise.all([
    listReviews({
      outcome: f.outcome,
      status: f.status,
      productLineage: f.product,
      from: f.from ? new Date(`${f.from}T00:00:00Z`) : undefined,
      to: f.to ? new Date(Date.parse(`${f.to}T00:00:00Z`) + 86_400_000) : undefined,
    }),
    listReviews(),
    listLatestDefinitions("product"),
  ]);
  const openAttention = all.filter((r) => r.status === "open" && r.outcome !== "accept");
  const openAccept = all.filter((r) => r.status === "open" && r.outcome === "accept");
  const overridden = all.filter((r) => r.status === "signed" && r.decision !== r.outcome);
  return (
    <>
      <h1>Reviews</h1>
      <section className="card" data-testid="attention">
        <h2 style={{ marginTop: 0 }}>Needs attention</h2>
        <ul>
          <li><strong>{openAttention.length}</strong> open review(s) suggesting hold or reject, awaiting sign-off{openAttention.length > 0 && <>: {openAttention.slice(0, 5).map((r, i) => <span key={r.id}>{i > 0 && ", "}<Link href={`/reviews/${r.id}`}>{r.title}</Link></span>)}</>}</li>
          <li><strong>{openAccept.length}</strong> open review(s) suggesting accept, awaiting sign-off</li>
          <li><strong>{overridden.length}</strong> signed review(s) where the reviewer&apos;s decision differs from the suggestion</li>
        </ul>
        <p className="no-print">
          Start: upload a logger file under <Link href="/traces">Traces</Link>, define the <Link href="/products">product</Link> (and its <Link href="/packs">pack</Link>), pick a <Link href="/limits">limit set</Link>, then <Link href="/reviews/new">run a review</Link>.
        </p>
      </section>
      <section className="card">
        <form className="no-print" style={{ display: "flex", flexWrap: "wrap", gap: "0.8rem", alignItems: "end", marginBottom: "1rem" }} aria-label="Filter reviews">
          <label>Suggested outcome
            <select name="outcome" defaultValue={f.outcome ?? ""}>
              <option value="">any</option><option value="accept">accept</option><option value="hold">hold for review</option><option value="reject">reject</option>
            </select>
          </label>
          <label>Status
            <select name="status" defaultValue={f.status ?? ""}>
              <option value="">any</option><option value="open">open</option><option value="signed">signed off</option>
            </select>
          </label>
          <label>Product
            <select name="product" defaultValue={f.product ?? ""}>
              <option value="">any</option>
              {products.map((p) => <option key={p.lineage} value={p.lineage}>{p.name}</option>)}
            </select>
          </label>
          <label>Run from <input type="date" name="from" defaultValue={f.from} /></label>
          <label>to <input type="date" name="to" defaultValue={f.to} /></label>
          <button type="submit" className="secondary">Filter</button>
          <Link href="/">Clear</Link>
        </form>
        {reviews.length === 0 ? <p className="muted">No reviews match.</p> : (
          <table data-testid="review-list">
            <thead><tr><th>Title</th><th>Trace</th><th>Product</th><th>Suggested</th><th>Status</th><th>Run (UTC)</th></tr></thead>
            <tbody>
              {reviews.map((r) => (
                <tr key={r.id}>
                  <td><Link href={`/reviews/${r.id}`}>{r.title}</Link>{r.correctsId && <span className="muted"> (correction)</span>}</td>
                  <td>{r.trace.name}</td>
                  <td>{r.product.name} v{r.product.version}</td>
                  <td><StatusBadge status={r.outcome} /></td>
                  <td>{r.status === "signed" ? <>signed: <StatusBadge status={r.decision ?? ""} /> by {r.signedBy}</> : "open"}</td>
                  <td>{r.createdAt.toISOString().slice(0, 16).replace("T", " ")}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        <Caution />
      </section>
    </>
  );
}
