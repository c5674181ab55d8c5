import Link from "next/link";
import { notFound } from "next/navigation";
import { laneOverview } from "@/lib/services/lanes";
import { displayZone } from "@/app/displayZone";
import { formatTime } from "@/lib/display/time";
import { fixed } from "@/lib/display/numbers";
import { StatusBadge } from "@/app/components/StatusBadge";
import { HISTORY_PROFILE_CAUTION } from "@/lib/shipment/historyProfile";
import { LaneProfileForm } from "./LaneProfileForm";

export const dynamic = "force-dynamic";

export default async function LanePage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const o = await laneOverview(id);
  if (!o) notFound();
  const zone = await displayZone();
  const positions = [...new Set(o.stats.map((s) => s.position))];
  const oldestFirst = [...o.shipments].reverse();
  return (
    <>
      <h1>Lane {o.lane.name}</h1>
      <p className="muted">{o.lane.origin} → {o.lane.destination}</p>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Shipments over time</h2>
        {oldestFirst.length === 0 ? <p className="muted">No shipments on this lane yet.</p> : (
          <table data-testid="lane-shipments">
            <thead><tr><th>Departure</th><th>Shipment</th><th className="num">Loggers</th><th>Outcome</th><th>Decision</th></tr></thead>
            <tbody>
              {oldestFirst.map((s) => (
                <tr key={s.id}>
                  <td>{formatTime(s.actualDepartureAt ?? s.plannedDepartureAt ?? s.createdAt, zone)}</td>
                  <td><Link href={`/shipments/${s.id}`}>{s.reference}</Link></td>
                  <td className="num">{s._count.loggers}</td>
                  <td>{s.outcome ? <StatusBadge status={s.outcome} /> : <span className="muted">not reviewed</span>}</td>
                  <td>{s.decision ?? "–"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Air excursions per position</h2>
        <p className="muted">For each position in the load and each rule threshold of the shipments&apos; limit sets: how many of the stored air traces went beyond it, and for how long (minutes, by linear interpolation between readings).</p>
        {o.stats.length === 0 ? <p className="muted">No stored traces yet.</p> : (
          <table data-testid="lane-stats">
            <thead><tr><th>Position</th><th>Threshold</th><th className="num">Traces beyond / traces</th><th className="num">Mean minutes beyond</th><th className="num">Most in one trace, min</th><th className="num">Longest spell, min</th></tr></thead>
            <tbody>
              {o.stats.map((s) => (
                <tr key={`${s.position}|${s.direction}|${s.threshold_C}`}>
                  <td>{s.position}</td><td>{s.direction} {s.threshold_C} °C</td><td className="num">{s.exceeded} / {s.traces}</td><td className="num">{fixed(s.mean_min, 1)}</td><td className="num">{fixed(s.max_min, 1)}</td><td className="num">{fixed(s.longest_continuous_min, 1)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Design profile from this lane&apos;s history</h2>
        <aside className="caution" data-testid="history-caution"><p>{HISTORY_PROFILE_CAUTION} Use it to size a pack with a margin, not as a record of any trip.</p></aside>
        <LaneProfileForm laneId={id} shipments={o.shipments.map((s) => ({ id: s.id, label: `${s.reference} (${formatTime(s.actualDepartureAt ?? s.plannedDepartureAt ?? s.createdAt, zone)})` }))} positions={positions} />
      </section>
    </>
  );
}
