import Link from "next/link";
import { z } from "zod";
import { reviewAttention, searchReviews } from "@/lib/db/reviews";
import { unreviewedTraces } from "@/lib/db/traces";
import { Pager } from "@/app/components/Pager";
import { dayEnd, dayParam, dayStart, listParamsSchema, nonEmpty } from "@/app/components/listParams";
import { listLatestDefinitions } from "@/lib/db/definitions";
import { StatusBadge } from "@/app/components/StatusBadge";
import { Caution } from "@/app/components/Caution";
import { displayZone } from "@/app/displayZone";
import { formatTime } from "@/lib/display/time";

export const dynamic = "force-dynamic";

const filterSchema = listParamsSchema.extend({
  outcome: z.enum(["accept", "hold", "reject"]).optional().catch(undefined),
  status: z.enum(["open", "signed"]).optional().catch(undefined),
  product: z.string().max(100).optional().catch(undefined),
  from: dayParam,
  to: dayParam,
});

export default async function HomePage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  // Filters come from the address bar; unknown or malformed values are ignored (shown as "any").
  const f = filterSchema.parse(nonEmpty(await searchParams));
  const zone = await displayZone();
  const [reviews, attention, unreviewed, products] = await Promise.all([
    searchReviews({ outcome: f.outcome, status: f.status, productLineage: f.product, from: dayStart(f.from, zone), to: dayEnd(f.to, zone), q: f.q, page: f.page }),
    reviewAttention(),
    unreviewedTraces(),
    listLatestDefinitions("product"),
  ]);
  const params = { outcome: f.outcome, status: f.status, product: f.product, from: f.from, to: f.to, q: f.q };
  return (
    <>
      <h1>Reviews</h1>
      <section className="card" data-testid="attention">
        <h2 style={{ marginTop: 0 }}>Needs attention</h2>
        <ul>
          <li><strong>{attention.openAttentionCount}</strong> open review(s) suggesting hold or reject, awaiting sign-off{attention.openAttention.length > 0 && <>: {attention.openAttention.map((r, i) => <span key={r.id}>{i > 0 && ", "}<Link href={`/reviews/${r.id}`}>{r.title}</Link></span>)}{attention.openAttentionCount > attention.openAttention.length && ", …"}</>}</li>
          <li><Link href="/?status=open&outcome=accept"><strong>{attention.openAcceptCount}</strong></Link> open review(s) suggesting accept, awaiting sign-off</li>
          <li><strong>{attention.overriddenCount}</strong> signed review(s) where the reviewer&apos;s decision differs from the suggestion</li>
          <li data-testid="attention-unreviewed"><strong>{unreviewed.total}</strong> uploaded trace(s) never reviewed{unreviewed.rows.length > 0 && <>: {unreviewed.rows.map((t, i) => <span key={t.id}>{i > 0 && ", "}<Link href={`/traces/${t.id}`}>{t.name}</Link></span>)}{unreviewed.total > unreviewed.rows.length && <>, … (<Link href="/traces">all traces</Link>)</>}</>}</li>
        </ul>
        <p className="no-print">
          Start: upload a logger file under <Link href="/traces">Traces</Link>, define the <Link href="/products">product</Link> (and its <Link href="/packs">pack</Link>), pick a <Link href="/limits">limit set</Link>, then <Link href="/reviews/new">run a review</Link>.
        </p>
      </section>
      <section className="card">
        <form className="filters no-print" aria-label="Filter reviews">
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
          <label>Search <input type="search" name="q" defaultValue={f.q} maxLength={100} placeholder="title, trace, product, reviewer" data-testid="search-input" /></label>
          <label>Run from <input type="date" name="from" defaultValue={f.from} /></label>
          <label>to <input type="date" name="to" defaultValue={f.to} /></label>
          <button type="submit" className="secondary">Filter</button>
          <Link href="/">Clear</Link>
        </form>
        <Pager path="/" params={params} page={reviews.page} pages={reviews.pages} total={reviews.total} pageSize={reviews.pageSize} noun="reviews" />
        {reviews.rows.length === 0 ? <p className="muted">No reviews match.</p> : (
          <table data-testid="review-list">
            <thead><tr><th>Title</th><th>Trace</th><th>Product</th><th>Suggested</th><th>Status</th><th>Run</th></tr></thead>
            <tbody>
              {reviews.rows.map((r) => (
                <tr key={r.id}>
                  <td><Link href={`/reviews/${r.id}`}>{r.title}</Link>{r.correctsId && <span className="muted"> (correction)</span>}</td>
                  <td>{r.trace.name}</td>
                  <td>{r.product.name} v{r.product.version}</td>
                  <td><StatusBadge status={r.outcome} /></td>
                  <td>{r.status === "signed" ? <>signed: <StatusBadge status={r.decision ?? ""} /> by {r.signedBy}</> : "open"}</td>
                  <td>{formatTime(r.createdAt, zone)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        <Pager path="/" params={params} page={reviews.page} pages={reviews.pages} total={reviews.total} pageSize={reviews.pageSize} noun="reviews" />
        <Caution />
      </section>
    </>
  );
}
