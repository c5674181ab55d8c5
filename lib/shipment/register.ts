// What a logger register entry changes in a review: its stated accuracy stands in for the limit set's
// sensor accuracy when the limit set states none, and a calibration overdue on the shipment date caps the
// outcome at hold (a reading from an instrument out of calibration cannot support an accept).
import type { LimitSet } from "../exposure/limits";
import type { Outcome } from "../exposure/rules";

export interface LoggerRegisterEntry {
  serial: string;
  accuracy_K: number;
  /** next calibration due, epoch s (UTC); none when not known */
  nextCalibration_s?: number | null;
}

/** The limit set a review of this logger's trace uses: the logger's accuracy only where the set has none. */
export function limitsForLogger(limits: LimitSet, logger: LoggerRegisterEntry | null | undefined): { limits: LimitSet; accuracy_from: "limits" | "logger" | "none" } {
  if (limits.sensor_accuracy_K !== undefined) return { limits, accuracy_from: "limits" };
  if (!logger) return { limits, accuracy_from: "none" };
  return { limits: { ...limits, sensor_accuracy_K: logger.accuracy_K }, accuracy_from: "logger" };
}

/** Whether the calibration was overdue on the shipment date (the due date had passed before it). */
export function calibrationOverdue(logger: LoggerRegisterEntry | null | undefined, shipmentDate_s: number): boolean {
  return !!logger && logger.nextCalibration_s != null && logger.nextCalibration_s < shipmentDate_s;
}

/** The outcome with an overdue calibration: accept becomes hold; hold and reject stay. */
export function capForCalibration(outcome: Outcome, overdue: boolean): Outcome {
  return overdue && outcome === "accept" ? "hold" : outcome;
}

export function overdueCaution(serial: string, due_s: number, shipmentDate_s: number): string {
  const day = (t: number) => new Date(t * 1000).toISOString().slice(0, 10);
  return `Logger ${serial} was due for calibration on ${day(due_s)}, before the shipment date ${day(shipmentDate_s)}: its readings are not covered by a current calibration, so its reviews are at best hold.`;
}
