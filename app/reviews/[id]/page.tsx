import Link from "next/link";
import { notFound } from "next/navigation";
import { getReview } from "@/lib/db/reviews";
import { getTrace } from "@/lib/db/traces";
import { displayZone } from "@/app/displayZone";
import { ConsequenceCard, HistoryCard, ReviewChart, ReviewHeader, RulesCard, ScreeningCard } from "./parts";
import { RenameForm, SignOffForm } from "./SignOffForm";
import { RecheckButton } from "./RecheckButton";
import { RecordVerified } from "./RecordVerified";
import { lastAuditEntry } from "@/lib/db/auditQueries";
import { can, pageActor } from "@/app/guard";
import { signatureRules } from "@/lib/services/signature";

export const dynamic = "force-dynamic";

export default async function ReviewPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const review = await getReview(id);
  if (!review) notFound();
  const trace = await getTrace(review.traceId);
  if (!trace) notFound();
  const lastCheck = await lastAuditEntry(id, "verify");
  const actor = await pageActor();
  const rules = await signatureRules(id);
  const mayWrite = can(actor, "review:run");
  const maySign = can(actor, "review:sign") && actor.kind === "user";
  const zone = await displayZone((review.trace.importSettings as { timeZone?: string } | null)?.timeZone);
  const q = new URLSearchParams({ trace: review.traceId, product: review.productId, limits: review.limitsId, model: String((review.options as { model?: string }).model ?? "auto") });
  if (review.packId) q.set("pack", review.packId);
  return (
    <>
      <h1>Review: {review.title}</h1>
      <p className="no-print">
        <Link href={`/reviews/${id}/report`} data-testid="report-link">Printable report</Link> · Export{" "}
        <a href={`/reviews/${id}/export/series.csv`} data-testid="export-series">predicted series (CSV)</a>,{" "}
        <a href={`/reviews/${id}/export/findings.csv`} data-testid="export-findings">findings (CSV)</a>,{" "}
        <a href={`/reviews/${id}/export/review.json`} data-testid="export-json">whole review (JSON)</a>
      </p>
      <ReviewHeader review={review} zone={zone} />
      <RecordVerified review={review} zone={zone} />
      <ReviewChart review={review} series={trace.series} zone={zone} />
      <ConsequenceCard review={review} series={trace.series} zone={zone} />
      <div className="grid2">
        <ScreeningCard review={review} />
        <HistoryCard review={review} zone={zone} />
      </div>
      <RulesCard review={review} zone={zone} />
      <section className="card no-print">
        <h2 style={{ marginTop: 0 }}>Re-check</h2>
        <RecheckButton reviewId={id} zone={zone} last={lastCheck ? { seq: lastCheck.seq, at: lastCheck.at.toISOString(), reproduced: (lastCheck.details as { reproduced?: boolean } | null)?.reproduced === true } : null} />
      </section>
      {review.status === "open" ? (
        <div className="grid2 no-print">
          <section className="card">
            <h2 style={{ marginTop: 0 }}>Sign off</h2>
            {maySign && actor.kind === "user" ? (
              rules.secondPerson && rules.runByUserId === actor.userId ? (
                <p data-testid="second-person-note">You ran this review, and its limit set asks for second-person review: another reviewer must sign it.</p>
              ) : (
                <SignOffForm reviewId={id} suggested={review.outcome as "accept" | "hold" | "reject"} signer={{ name: actor.name, email: actor.email }} secondPerson={rules.secondPerson} />
              )
            ) : (
              <p data-testid="cannot-sign">Your role ({actor.kind === "user" || actor.kind === "token" ? actor.role : actor.kind}) cannot sign off reviews; a reviewer or an administrator signs.</p>
            )}
          </section>
          {mayWrite && (
            <section className="card">
              <h2 style={{ marginTop: 0 }}>Edit</h2>
              <RenameForm reviewId={id} title={review.title} />
            </section>
          )}
        </div>
      ) : (
        <section className="card no-print">
          <p>This review is signed off and final. <Link href={`/reviews/new?${q.toString()}&corrects=${id}`} data-testid="start-correction">Start a correction</Link>: a new review that points back to this one.</p>
        </section>
      )}
    </>
  );
}
