import { notFound } from "next/navigation";
import { getShipment } from "@/lib/db/shipments";
import { displayZone } from "@/app/displayZone";
import { formatTime } from "@/lib/display/time";
import type { ReviewResult } from "@/lib/review";
import { LoadChartCard, OutcomeCard, RuleMatrix, ShipmentCautions, ShipmentHeader, WorstExcursions, loggerLabel, productNames } from "../parts";

export const dynamic = "force-dynamic";

/** The whole shipment on paper: header, outcome, chart, matrix, excursions, every review's rules, sign-off. */
export default async function ShipmentReport({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const s = await getShipment(id);
  if (!s) notFound();
  const zone = await displayZone();
  const names = await productNames(s);
  const logger = new Map(s.loggers.map((l) => [l.id, l]));
  return (
    <div className="report" data-testid="shipment-report">
      <h1>Shipment report: {s.reference}</h1>
      <p className="muted">Printed {formatTime(new Date(), zone)}. Times in {zone}.</p>
      <ShipmentHeader s={s} zone={zone} />
      <ShipmentCautions s={s} />
      <OutcomeCard s={s} names={names} />
      <LoadChartCard s={s} names={names} zone={zone} />
      <RuleMatrix s={s} names={names} />
      <WorstExcursions s={s} names={names} zone={zone} />
      {s.reviews.map((link) => {
        const r = link.review.result as unknown as ReviewResult;
        const l = logger.get(link.shipmentLoggerId);
        return (
          <section className="card" key={link.id} data-testid="report-review">
            <h2 style={{ marginTop: 0 }}>{l ? loggerLabel(l) : "?"} × {names.get(link.productId) ?? link.productId}: {link.review.outcome}</h2>
            <p className="muted">Review {link.review.id} · {link.review.status === "signed" ? `signed, decision ${link.review.decision}` : "open"} · model {r.screening.model}, tau {Math.round(r.screening.tau_s / 60)} min</p>
            <table>
              <thead><tr><th>Rule</th><th>Channel</th><th className="num">Threshold, °C</th><th className="num">Guard, K</th><th className="num">Minutes beyond</th><th className="num">Longest, min</th><th>Status</th><th>Reason</th></tr></thead>
              <tbody>
                {r.rules.map((x) => (
                  <tr key={x.id}><td>{x.id}</td><td>{x.channel}</td><td className="num">{x.threshold_C}</td><td className="num">{x.guard_K}</td><td className="num">{x.cumulative_min.toFixed(1)}</td><td className="num">{x.longest_continuous_min.toFixed(1)}</td><td>{x.status}</td><td>{x.reason}</td></tr>
                ))}
              </tbody>
            </table>
          </section>
        );
      })}
    </div>
  );
}
