import Link from "next/link";
import { WriteGate } from "@/app/components/WriteGate";
import { listMonitors, openAlertList } from "@/lib/db/monitors";
import { listLatestDefinitions } from "@/lib/db/definitions";
import { displayZone } from "@/app/displayZone";
import { formatTime } from "@/lib/display/time";
import { ensureSweeper } from "@/lib/services/monitors";
import { MonitorForm } from "./MonitorForm";

export const dynamic = "force-dynamic";

export default async function MonitorsPage() {
  ensureSweeper();
  const [monitors, alerts, products, packs, limits, zone] = await Promise.all([listMonitors(), openAlertList(), listLatestDefinitions("product"), listLatestDefinitions("pack"), listLatestDefinitions("limits"), displayZone()]);
  const opt = (d: { id: string; name: string; version: number }) => ({ id: d.id, label: `${d.name} v${d.version}` });
  return (
    <>
      <h1>Monitors</h1>
      <p className="muted">
        A monitor takes readings while the shipment is still moving, predicts the product&apos;s core reading by reading, forecasts when it reaches a limit with the
        air held where it is, and raises alerts. Closing a monitor makes its readings a stored trace and a normal review.
      </p>
      <section className="card" data-testid="open-alerts">
        <h2 style={{ marginTop: 0 }}>Open alerts</h2>
        {alerts.length === 0 ? (
          <p className="muted">No open alerts.</p>
        ) : (
          <table>
            <thead><tr><th>Monitor</th><th>Alert</th><th>Raised</th></tr></thead>
            <tbody>
              {alerts.map((a) => (
                <tr key={a.id}>
                  <td><Link href={`/monitors/${a.monitorId}`}>{a.monitorName}</Link></td>
                  <td><span className="status status-fail">{a.kind}</span> {a.message}</td>
                  <td>{formatTime(a.raisedAt, zone)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>All monitors</h2>
        {monitors.length === 0 ? (
          <p className="muted">No monitors yet: create one below.</p>
        ) : (
          <table data-testid="monitor-list">
            <thead><tr><th>Name</th><th>Shipment</th><th>Logger</th><th className="num">Readings</th><th>Last reading</th><th>Open alerts</th><th>Status</th></tr></thead>
            <tbody>
              {monitors.map((m) => (
                <tr key={m.id}>
                  <td><Link href={`/monitors/${m.id}`}>{m.name}</Link></td>
                  <td>{m.shipmentId ?? ""}</td>
                  <td>{m.serial ?? ""}</td>
                  <td className="num">{m.readingCount}</td>
                  <td>{m.lastReadingAt ? formatTime(m.lastReadingAt, zone) : "none yet"}</td>
                  <td>{m.openAlerts ? <span className="status status-fail">{m.openAlerts}</span> : ""}</td>
                  <td>{m.status === "open" ? "live" : m.reviewId ? <Link href={`/reviews/${m.reviewId}`}>closed: review</Link> : "closed"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Create a monitor</h2>
        <WriteGate permission="monitor:edit">
        <MonitorForm products={products.map(opt)} packs={packs.map(opt)} limits={limits.map(opt)} />
        </WriteGate>
      </section>
    </>
  );
}
