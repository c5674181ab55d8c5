// The canonical content of the shipment tables' rows and its SHA-256, for the audit entry that records
// each change (as lib/review/content.ts does for traces, definitions and reviews). Dates as ISO text.
import { canonicalJson } from "../review/canonical";
import { sha256Hex } from "../trace/hash";

function plain(row: Record<string, unknown>): Record<string, unknown> {
  return Object.fromEntries(Object.entries(row).map(([k, v]) => [k, v instanceof Date ? v.toISOString() : v]));
}

/** SHA-256 of a row of Lane, Logger, Shipment, ShipmentLogger or ShipmentReview, named by its table. */
export function shipmentRowContentHash(table: "Lane" | "Logger" | "Shipment" | "ShipmentLogger" | "ShipmentReview", row: Record<string, unknown>): string {
  return sha256Hex(canonicalJson({ table, row: plain(row) }));
}
