import Link from "next/link";
import { listShipments } from "@/lib/db/shipments";
import { displayZone } from "@/app/displayZone";
import { formatTime } from "@/lib/display/time";
import { StatusBadge } from "@/app/components/StatusBadge";
import { can, pageActor } from "@/app/guard";

export const dynamic = "force-dynamic";

export default async function ShipmentsPage() {
  const [shipments, zone, actor] = await Promise.all([listShipments(), displayZone(), pageActor()]);
  return (
    <>
      <h1>Shipments</h1>
      <p className="muted">A shipment is one load (a truck, a container) with several loggers and products, reviewed and signed off as a whole. <Link href="/lanes">Lanes</Link> · <Link href="/loggers">Logger register</Link></p>
      {can(actor, "shipment:edit") && <p><Link href="/shipments/new" data-testid="new-shipment">New shipment</Link></p>}
      {shipments.length === 0 ? <p className="muted">No shipments yet.</p> : (
        <table data-testid="shipment-list">
          <thead><tr><th>Reference</th><th>Lane</th><th>Departure</th><th className="num">Loggers</th><th>Outcome</th><th>Status</th></tr></thead>
          <tbody>
            {shipments.map((s) => (
              <tr key={s.id}>
                <td><Link href={`/shipments/${s.id}`}>{s.reference}</Link></td>
                <td>{s.lane ? <Link href={`/lanes/${s.lane.id}`}>{s.lane.name}</Link> : "–"}</td>
                <td>{s.actualDepartureAt ?? s.plannedDepartureAt ? formatTime((s.actualDepartureAt ?? s.plannedDepartureAt)!, zone) : "–"}</td>
                <td className="num">{s._count.loggers}</td>
                <td>{s.outcome ? <StatusBadge status={s.outcome} /> : <span className="muted">not reviewed</span>}</td>
                <td>{s.status === "signed" ? `signed: ${s.decision}` : "open"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </>
  );
}
