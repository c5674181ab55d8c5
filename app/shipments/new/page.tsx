import { listLatestDefinitions } from "@/lib/db/definitions";
import { listLanes } from "@/lib/db/shipments";
import { ShipmentForm } from "./ShipmentForm";
import { WriteGate } from "@/app/components/WriteGate";

export const dynamic = "force-dynamic";

export default async function NewShipmentPage() {
  const [lanes, limits, products, packs] = await Promise.all([listLanes(), listLatestDefinitions<{ name: string }>("limits"), listLatestDefinitions<{ name: string }>("product"), listLatestDefinitions<{ name: string }>("pack")]);
  const opt = (d: { id: string; name: string; version: number }) => ({ id: d.id, label: `${d.name} v${d.version}` });
  return (
    <>
      <h1>New shipment</h1>
      <p className="muted">Name the load and its loggers: where each sat and which products it stands for. The files come next, all at once, on the shipment&apos;s page.</p>
      <WriteGate permission="shipment:edit">
        <ShipmentForm lanes={lanes.map((l) => ({ id: l.id, label: `${l.name} (${l.origin} → ${l.destination})` }))} limits={limits.map(opt)} products={products.map(opt)} packs={packs.map(opt)} />
      </WriteGate>
    </>
  );
}
