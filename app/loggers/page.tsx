import Link from "next/link";
import { listLoggers, getLogger } from "@/lib/db/shipments";
import { displayZone } from "@/app/displayZone";
import { formatTime } from "@/lib/display/time";
import { LoggerForm } from "./LoggerForm";
import { WriteGate } from "@/app/components/WriteGate";
import { can, pageActor } from "@/app/guard";

export const dynamic = "force-dynamic";

export default async function LoggersPage({ searchParams }: { searchParams: Promise<{ edit?: string; serial?: string }> }) {
  const { edit, serial } = await searchParams;
  const [loggers, zone, actor] = await Promise.all([listLoggers(), displayZone(), pageActor()]);
  // registering and editing are shipment:edit (saveLoggerAction); other roles read the register only
  const mayEdit = can(actor, "shipment:edit");
  const editing = edit && mayEdit ? await getLogger(edit) : null;
  const now = Date.now();
  const day = (d: Date | null) => (d ? formatTime(d, zone).slice(0, 10) : "–");
  return (
    <>
      <h1>Logger register</h1>
      <p className="muted">Each logger&apos;s stated accuracy is used as the rules&apos; sensor accuracy when a limit set states none; a logger whose calibration was due before a shipment&apos;s departure gives that shipment&apos;s reviews at best hold. New serials found in uploaded files are registered with the accuracy asked once.</p>
      {loggers.length === 0 ? <p className="muted">No loggers registered yet.</p> : (
        <table data-testid="logger-register">
          <thead><tr><th>Serial</th><th>Description</th><th className="num">Accuracy, K</th><th>Last calibration</th><th>Next calibration due</th>{mayEdit && <th />}</tr></thead>
          <tbody>
            {loggers.map((l) => (
              <tr key={l.id}>
                <td>{l.serial}</td><td>{l.description}</td><td className="num">±{l.accuracyK}</td><td>{day(l.lastCalibrationAt)}</td>
                <td>{day(l.nextCalibrationAt)}{l.nextCalibrationAt && l.nextCalibrationAt.getTime() < now ? <strong className="status status-fail"> overdue</strong> : null}</td>
                {mayEdit && <td><Link href={`/loggers?edit=${l.id}`}>Edit</Link></td>}
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <section className="card">
        <h2 style={{ marginTop: 0 }}>{editing ? `Edit ${editing.serial}` : "Register a logger"}</h2>
        <WriteGate permission="shipment:edit">
        <LoggerForm key={editing?.id ?? "new"} serial={serial?.slice(0, 120)} editing={editing ? { id: editing.id, serial: editing.serial, description: editing.description, accuracyK: String(editing.accuracyK), lastCalibrationAt: editing.lastCalibrationAt?.toISOString().slice(0, 16) ?? "", nextCalibrationAt: editing.nextCalibrationAt?.toISOString().slice(0, 16) ?? "" } : undefined} />
        </WriteGate>
      </section>
    </>
  );
}
