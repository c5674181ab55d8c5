import { notFound } from "next/navigation";
import { getReview } from "@/lib/db/reviews";
import { getTrace } from "@/lib/db/traces";
import { displayZone } from "@/app/displayZone";
import { formatTime } from "@/lib/display/time";
import { ConsequenceCard, HistoryCard, ReviewChart, ReviewHeader, RulesCard, ScreeningCard } from "../parts";
import { PrintButton } from "./PrintButton";
import { RecordVerified } from "../RecordVerified";
import { DefinitionParameters } from "@/app/components/DefinitionParameters";

export const dynamic = "force-dynamic";

/** The review laid out for paper: print from the browser ("Save as PDF") for a clean document. */
export default async function ReportPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const review = await getReview(id);
  if (!review) notFound();
  const trace = await getTrace(review.traceId);
  if (!trace) notFound();
  const zone = await displayZone((review.trace.importSettings as { timeZone?: string } | null)?.timeZone);
  return (
    <article className="report" data-testid="report">
      <p className="no-print"><PrintButton /></p>
      <h1>Corelag review report: {review.title}</h1>
      <p className="muted">Report generated {formatTime(new Date(), zone)} from review {review.id}.</p>
      <ReviewHeader review={review} zone={zone} />
      <RecordVerified review={review} printing zone={zone} />
      <ReviewChart review={review} series={trace.series} zone={zone} />
      <ConsequenceCard review={review} series={trace.series} zone={zone} />
      <section className="card" data-testid="report-parameters">
        <h2 style={{ marginTop: 0 }}>Inputs used</h2>
        <p className="muted">The exact definition versions this review ran on, with every parameter as stored (shown to at most 6 significant digits; the JSON export holds the exact values).</p>
        <DefinitionParameters def={review.product} />
        {review.pack ? <DefinitionParameters def={review.pack} /> : <p>No pack: the product&apos;s own surface coefficient was used.</p>}
        <DefinitionParameters def={review.limits} />
        <p data-testid="report-options">Model choice: {String((review.options as { model?: string }).model ?? "auto")}; engine {review.engineVersion}.</p>
      </section>
      <ScreeningCard review={review} />
      <RulesCard review={review} zone={zone} />
      <HistoryCard review={review} zone={zone} />
      {review.status !== "signed" && <p className="caution" data-testid="unsigned-note">Not signed off: this report shows a suggested outcome only.</p>}
    </article>
  );
}
