import Link from "next/link";
import { getDefinition } from "@/lib/db/definitions";
import { getTrace } from "@/lib/db/traces";
import type { StoredShipment } from "@/lib/db/shipments";
import type { ShipmentResult } from "@/lib/services/shipments";
import type { ReviewResult } from "@/lib/review";
import { isThresholdRule, type LimitSet } from "@/lib/exposure/limits";
import { bytesToFloat64 } from "@/lib/db/bytes";
import { displaySeries } from "@/lib/display/series";
import { formatC, fixed } from "@/lib/display/numbers";
import { formatTime } from "@/lib/display/time";
import { StatusBadge } from "@/app/components/StatusBadge";
import { describeRule } from "@/lib/review/parameters";
import { LoadChart, type LoadSeries } from "@/app/components/LoadChart";

const COLORS = ["#1f5fa8", "#b5551d", "#2f7d32", "#8a3ea8", "#a8891f", "#1f8a8a", "#a81f5f", "#555f6b", "#3d6b1f", "#6b3d1f"];

export async function productNames(s: StoredShipment): Promise<Map<string, string>> {
  const ids = new Set(s.loggers.flatMap((l) => l.products.flatMap((p) => [p.productId, ...(p.packId ? [p.packId] : [])])));
  const out = new Map<string, string>();
  for (const id of ids) {
    const d = await getDefinition(id);
    if (d) out.set(id, `${d.name} v${d.version}`);
  }
  return out;
}

export const loggerLabel = (l: { ordinal: number; position: string }) => `${l.ordinal}. ${l.position}`;

export function ShipmentHeader({ s, zone }: { s: StoredShipment; zone: string }) {
  const t = (d: Date | null) => (d ? formatTime(d, zone) : "–");
  return (
    <section className="card">
      <table data-testid="shipment-header">
        <tbody>
          <tr><th scope="row">Lane</th><td>{s.lane ? <Link href={`/lanes/${s.lane.id}`}>{s.lane.name}</Link> : "–"}</td><th scope="row">Limit set</th><td>{s.limits.name} v{s.limits.version}</td></tr>
          <tr><th scope="row">Carrier</th><td>{s.carrier ?? "–"}</td><th scope="row">Vehicle</th><td>{s.vehicle ?? "–"}</td></tr>
          <tr><th scope="row">Departure</th><td>planned {t(s.plannedDepartureAt)}, actual {t(s.actualDepartureAt)}</td><th scope="row">Arrival</th><td>planned {t(s.plannedArrivalAt)}, actual {t(s.actualArrivalAt)}</td></tr>
          {s.notes && <tr><th scope="row">Notes</th><td colSpan={3}>{s.notes}</td></tr>}
          <tr><th scope="row">Status</th><td colSpan={3} data-testid="shipment-status">{s.status === "signed" ? `signed off by ${s.signedBy} on ${t(s.signedAt)}: decision ${s.decision}${s.signComment ? ` (“${s.signComment}”)` : ""}${s.signMeaning ? `. Meaning: ${s.signMeaning}.` : ""}` : "open"}</td></tr>
        </tbody>
      </table>
    </section>
  );
}

export function OutcomeCard({ s, names }: { s: StoredShipment; names: Map<string, string> }) {
  const r = s.result as unknown as ShipmentResult | null;
  if (!r) return null;
  const logger = new Map(s.loggers.map((l) => [l.id, l]));
  return (
    <section className="card" data-testid="shipment-outcome">
      <p className="outcome">Suggested outcome for the load: <strong className={`status status-${r.outcome}`}>{r.outcome === "hold" ? "hold for review" : r.outcome}</strong></p>
      <p className="muted">Rejected if any product&apos;s governing review rejects, held if any holds, accepted only if all accept.</p>
      <table data-testid="product-outcomes">
        <thead><tr><th>Product</th><th>Outcome</th><th>Governing logger</th><th>Why that logger</th></tr></thead>
        <tbody>
          {r.products.map((p) => (
            <tr key={p.productId}>
              <td>{names.get(p.productId) ?? p.productId}</td>
              <td><StatusBadge status={p.outcome} /></td>
              <td data-testid="governing-logger">{logger.get(p.governing_logger) ? loggerLabel(logger.get(p.governing_logger)!) : p.governing_logger}</td>
              <td>{p.governing_by === "named" ? "named on the shipment" : "worst of the loggers covering it"}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}

/** Product × rule: for each logger × product review, every rule's status; the governing review of each product marked. */
export function RuleMatrix({ s, names }: { s: StoredShipment; names: Map<string, string> }) {
  const r = s.result as unknown as ShipmentResult | null;
  if (!r || s.reviews.length === 0) return null;
  const defined = (s.limits.body as unknown as LimitSet).rules;
  const rules = defined.map((x) => x.id);
  const governing = new Set(r.products.map((p) => `${p.governing_logger}|${p.productId}`));
  const logger = new Map(s.loggers.map((l) => [l.id, l]));
  return (
    <section className="card">
      <h2 style={{ marginTop: 0 }}>Products × rules</h2>
      <table data-testid="rule-matrix">
        <thead>
          <tr>
            <th>Product</th><th>Logger</th>
            {/* each rule with what it allows, so a cell's minutes can be read against it */}
            {defined.map((x) => <th key={x.id} data-testid={`rule-head-${x.id}`}>{x.id}<span className="muted" style={{ display: "block", fontWeight: 400, fontSize: "0.8rem" }}>{describeRule(x)}</span></th>)}
            <th>Review</th>
          </tr>
        </thead>
        <tbody>
          {s.reviews.map((link) => {
            const result = link.review.result as unknown as ReviewResult;
            const gov = governing.has(`${link.shipmentLoggerId}|${link.productId}`);
            return (
              <tr key={link.id} data-governing={gov ? "yes" : "no"} style={gov ? { fontWeight: 600 } : undefined}>
                <td>{names.get(link.productId) ?? link.productId}{gov ? " (governing)" : ""}</td>
                <td>{logger.get(link.shipmentLoggerId) ? loggerLabel(logger.get(link.shipmentLoggerId)!) : "?"}</td>
                {rules.map((id) => {
                  const threshold = result.rules.find((x) => x.id === id);
                  const rule = threshold ?? result.consequence_rules?.find((x) => x.id === id);
                  return (
                    <td key={id} title={rule?.reason}>
                      {rule ? <StatusBadge status={rule.status} /> : "–"}
                      {threshold && <span className="muted" style={{ display: "block", fontSize: "0.8rem" }}>{fixed(threshold.cumulative_min, 1)} min beyond</span>}
                    </td>
                  );
                })}
                <td><StatusBadge status={link.review.outcome} /> <Link href={`/reviews/${link.review.id}`} className="no-print">view the review</Link></td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </section>
  );
}

export function WorstExcursions({ s, names, zone }: { s: StoredShipment; names: Map<string, string>; zone: string }) {
  const r = s.result as unknown as ShipmentResult | null;
  if (!r) return null;
  const logger = new Map(s.loggers.map((l) => [l.id, l]));
  return (
    <section className="card">
      <h2 style={{ marginTop: 0 }}>Worst excursions across the load</h2>
      {r.worst_excursions.length === 0 ? <p className="muted">No channel went beyond a rule threshold.</p> : (
        <table data-testid="worst-excursions">
          <thead><tr><th>Logger</th><th>Product</th><th>Rule</th><th>Start</th><th className="num">Minutes</th><th className="num">Peak</th><th className="num">Degree-minutes, K·min</th></tr></thead>
          <tbody>
            {r.worst_excursions.map((e, i) => (
              <tr key={i}>
                <td>{logger.get(e.logger) ? loggerLabel(logger.get(e.logger)!) : e.logger}</td>
                <td>{e.product === "(air)" ? "air (all its products)" : (names.get(e.product) ?? e.product)}</td>
                <td>{e.rule} ({e.channel})</td>
                <td>{formatTime(Date.parse(e.start), zone)}</td>
                <td className="num">{fixed(e.duration_min, 1)}</td>
                <td className="num">{formatC(e.peak_C)}</td>
                <td className="num">{fixed(e.degree_min, 1)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}

export function ShipmentCautions({ s }: { s: StoredShipment }) {
  const r = s.result as unknown as ShipmentResult | null;
  return (
    <aside className="caution" data-testid="caution" aria-label="Caution">
      {(r?.cautions ?? ["Core temperatures are model estimates from the recorded air temperature, not measurements.", "The suggested outcome supports, and does not replace, the decision of the responsible food-safety professional; local regulations and your own food-safety plan govern."]).map((c) => <p key={c}>{c}</p>)}
    </aside>
  );
}

/** The chart data: each logger's air (display-decimated, every excursion's peak kept) and its reviews' predicted cores. */
export async function LoadChartCard({ s, names, zone }: { s: StoredShipment; names: Map<string, string>; zone: string }) {
  const limits = (s.limits.body as unknown as LimitSet).rules.filter(isThresholdRule);
  const thresholds = [...new Set(limits.map((r) => r.above_C ?? r.below_C!))].map((v) => ({ value_C: v, label: `${v} °C` }));
  const series: LoadSeries[] = [];
  for (const [i, l] of s.loggers.entries()) {
    if (!l.traceId) continue;
    const trace = await getTrace(l.traceId);
    if (!trace) continue;
    const reviews = s.reviews.filter((r) => r.shipmentLoggerId === l.id);
    const channels: Record<string, Float64Array> = { air: trace.series.air_C };
    reviews.forEach((r, j) => (channels[`core${j}`] = bytesToFloat64(r.review.coreC)));
    const d = displaySeries({ t_s: trace.series.t_s, channels, thresholds: limits.map((r) => ({ value_C: r.above_C ?? r.below_C!, direction: r.above_C !== undefined ? "above" : "below", channels: Object.keys(channels) })), buckets: 300 });
    series.push({
      key: `l${l.ordinal}`,
      label: loggerLabel(l),
      color: COLORS[i % COLORS.length]!,
      times_ms: d.times_ms,
      air: d.channels.air!,
      cores: reviews.map((r, j) => ({ label: names.get(r.productId) ?? r.productId, values: d.channels[`core${j}`]! })),
    });
  }
  if (series.length === 0) return null;
  return (
    <section className="card chart-card">
      <h2 style={{ marginTop: 0 }}>All loggers on one time axis</h2>
      <LoadChart loggers={series} thresholds={thresholds} zone={zone} title={`Air and predicted cores of shipment ${s.reference}`} />
    </section>
  );
}
