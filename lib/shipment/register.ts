// What a logger register entry brings to a review (issue 15): runReview's `options.logger` (the logger's
// stated accuracy stands in for the limit set's sensor accuracy when the set states none; a calibration
// due before the shipment date makes the outcome at best hold). Stored with the review's options, so a
// re-run reproduces it.
import type { ReviewOptions } from "../review/runReview";

export interface LoggerRegisterEntry {
  serial: string;
  accuracy_K: number;
  /** next calibration due, epoch s (UTC); null when not known */
  nextCalibration_s?: number | null;
}

const iso = (t_s: number) => new Date(Math.round(t_s * 1000)).toISOString();

/** The review option for a trace from this logger on a shipment dated shipmentDate_s (epoch s). */
export function loggerReviewOption(logger: LoggerRegisterEntry, shipmentDate_s: number): NonNullable<ReviewOptions["logger"]> {
  return {
    serial: logger.serial,
    accuracy_K: logger.accuracy_K,
    ...(logger.nextCalibration_s != null ? { calibration_due: iso(logger.nextCalibration_s), shipment_date: iso(shipmentDate_s) } : {}),
  };
}

/** Whether the calibration was overdue on the shipment date (the due date had passed before it). */
export function calibrationOverdue(logger: LoggerRegisterEntry | null | undefined, shipmentDate_s: number): boolean {
  return !!logger && logger.nextCalibration_s != null && logger.nextCalibration_s < shipmentDate_s;
}
