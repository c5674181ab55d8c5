import Link from "next/link";
import { listReviews } from "@/lib/db/reviews";
import { StatusBadge } from "@/app/components/StatusBadge";
import { Caution } from "@/app/components/Caution";

export const dynamic = "force-dynamic";

export default async function HomePage() {
  const reviews = await listReviews();
  const count = (o: string) => reviews.filter((r) => r.outcome === o).length;
  return (
    <>
      <h1>Reviews</h1>
      <section className="card">
        <p>
          Upload a logger file under <Link href="/traces">Traces</Link>, define the <Link href="/products">product</Link> and a{" "}
          <Link href="/limits">limit set</Link>, then <Link href="/reviews/new">run a review</Link>: Corelag predicts the product&apos;s core temperature from
          the recorded air and judges the limits on both.
        </p>
        <p data-testid="review-summary">
          {reviews.length} review(s): {count("reject")} reject, {count("hold")} hold for review, {count("accept")} accept.
        </p>
        <p className="no-print"><Link href="/reviews/new">New review →</Link></p>
      </section>
      <section className="card">
        {reviews.length === 0 ? <p className="muted">No reviews yet.</p> : (
          <table data-testid="review-list">
            <thead><tr><th>Title</th><th>Trace</th><th>Product</th><th>Suggested outcome</th><th>Run (UTC)</th></tr></thead>
            <tbody>
              {reviews.map((r) => (
                <tr key={r.id}>
                  <td><Link href={`/reviews/${r.id}`}>{r.title}</Link></td>
                  <td>{r.trace.name}</td>
                  <td>{r.product.name} v{r.product.version}</td>
                  <td><StatusBadge status={r.outcome} /></td>
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
