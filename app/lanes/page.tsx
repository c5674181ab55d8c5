import Link from "next/link";
import { listLanes } from "@/lib/db/shipments";

export const dynamic = "force-dynamic";

export default async function LanesPage() {
  const lanes = await listLanes();
  return (
    <>
      <h1>Lanes</h1>
      <p className="muted">A lane is a route, origin to destination, shared by many shipments. New lanes are made with a shipment.</p>
      {lanes.length === 0 ? <p className="muted">No lanes yet.</p> : (
        <table>
          <thead><tr><th>Lane</th><th>Origin</th><th>Destination</th><th className="num">Shipments</th></tr></thead>
          <tbody>{lanes.map((l) => <tr key={l.id}><td><Link href={`/lanes/${l.id}`}>{l.name}</Link></td><td>{l.origin}</td><td>{l.destination}</td><td className="num">{l._count.shipments}</td></tr>)}</tbody>
        </table>
      )}
    </>
  );
}
