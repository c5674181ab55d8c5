import Link from "next/link";
import { notFound } from "next/navigation";
import { getShipment } from "@/lib/db/shipments";
import { displayZone } from "@/app/displayZone";
import { formatTime } from "@/lib/display/time";
import { BatchUpload } from "./BatchUpload";
import { RunShipmentButton, ShipmentSignOff } from "./ShipmentForms";
import { can, pageActor } from "@/app/guard";
import { LoadChartCard, OutcomeCard, RuleMatrix, ShipmentCautions, ShipmentHeader, WorstExcursions, loggerLabel, productNames } from "./parts";

export const dynamic = "force-dynamic";

export default async function ShipmentPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const s = await getShipment(id);
  if (!s) notFound();
  const zone = await displayZone();
  const actor = await pageActor();
  const mayEdit = can(actor, "shipment:edit");
  const mayRun = can(actor, "review:run");
  const maySign = can(actor, "review:sign") && actor.kind === "user";
  const names = await productNames(s);
  const allTraces = s.loggers.length > 0 && s.loggers.every((l) => l.traceId);
  return (
    <>
      <h1>Shipment {s.reference}</h1>
      <p className="no-print"><Link href="/shipments">All shipments</Link>{s.outcome && <> · <Link href={`/shipments/${id}/report`} data-testid="shipment-report-link">Printable report of the whole shipment</Link></>}</p>
      <ShipmentHeader s={s} zone={zone} />
      <ShipmentCautions s={s} />
      <OutcomeCard s={s} names={names} />
      <LoadChartCard s={s} names={names} zone={zone} />
      <RuleMatrix s={s} names={names} />
      <WorstExcursions s={s} names={names} zone={zone} />
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Loggers in the load</h2>
        <table data-testid="logger-entries">
          <thead><tr><th>Logger</th><th>Serial / file name</th><th>Products (pack)</th><th>Trace</th></tr></thead>
          <tbody>
            {s.loggers.map((l) => (
              <tr key={l.id} data-testid="logger-entry">
                <td>{loggerLabel(l)}</td>
                <td>{[l.serial ? `serial ${l.serial}` : null, l.fileNamePattern ? `file ${l.fileNamePattern}` : null].filter(Boolean).join(" · ") || "–"}</td>
                <td>{l.products.map((p) => `${names.get(p.productId) ?? p.productId}${p.packId ? ` (${names.get(p.packId) ?? p.packId})` : ""}${p.governing ? ", governing" : ""}`).join("; ")}</td>
                <td>{l.trace ? <Link href={`/traces/${l.trace.id}`}>{l.trace.fileName}</Link> : <span className="muted">no file yet</span>}{l.trace ? <span className="muted"> · {formatTime(l.trace.startAt, zone)} · {l.trace.sampleCount} samples</span> : null}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      {s.status === "open" && !mayEdit && (
        <p className="muted no-print" data-testid="read-only">Open for review. Your role reads this shipment; a reviewer uploads its files, runs it and signs it off.</p>
      )}
      {s.status === "open" && mayEdit && (
        <>
          <section className="card no-print">
            <h2 style={{ marginTop: 0 }}>Upload the loggers&apos; files</h2>
            <BatchUpload shipmentId={id} entries={s.loggers.map((l) => ({ id: l.id, label: `${loggerLabel(l)}${l.serial ? ` (${l.serial})` : ""}` }))} />
          </section>
          <section className="card no-print">
            <h2 style={{ marginTop: 0 }}>Shipment review</h2>
            {!mayRun ? (
              <p className="muted">Your role cannot run reviews.</p>
            ) : allTraces ? (
              <>
                <p className="muted">Runs every logger × product review ({s.loggers.reduce((n, l) => n + l.products.length, 0)} in all) in the background, then gives the load its outcome.</p>
                <RunShipmentButton shipmentId={id} again={!!s.outcome} />
              </>
            ) : (
              <p className="muted">Upload a file for every logger first.</p>
            )}
          </section>
          {s.outcome && (
            <section className="card no-print">
              <h2 style={{ marginTop: 0 }}>Sign off</h2>
              {maySign && actor.kind === "user" ? (
                <ShipmentSignOff shipmentId={id} suggested={s.outcome as "accept" | "hold" | "reject"} reviews={s.reviews.length} signer={{ name: actor.name, email: actor.email }} />
              ) : (
                <p className="muted" data-testid="cannot-sign">Your role cannot sign off; a reviewer or an administrator signs.</p>
              )}
            </section>
          )}
        </>
      )}
    </>
  );
}
