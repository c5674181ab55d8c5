// The canonical content of each stored row, and its SHA-256: what an audit entry vouches for.
// Rows are given as plain values (dates as Date or ISO text, JSON as parsed values, series as bytes),
// so the same hash comes out whichever database or driver read them.
import { canonicalJson } from "./canonical";
import { sha256Hex } from "../trace/hash";

type When = Date | string;
type Blob = Uint8Array | null;

export interface TraceRowContent {
  id: string;
  name: string;
  fileName: string;
  /** the stored SHA-256 column (checked separately against the bytes) */
  sha256: string;
  /**
   * the original file's bytes; null in a light check (a page view), where the stored `sha256` column
   * stands in for their hash and the bytes are compared with it only by a re-check or `corelag verify`
   */
  original: Uint8Array | null;
  importSettings: unknown;
  timesS: Uint8Array;
  airC: Uint8Array;
  probeC: Blob;
  sampleCount: number;
  startAt: When;
  endAt: When;
  warnings: unknown;
  createdAt: When;
}

export interface DefinitionRowContent {
  id: string;
  kind: string;
  lineage: string;
  version: number;
  name: string;
  body: unknown;
  sha256: string;
  createdAt: When;
}

export interface ReviewRowContent {
  id: string;
  title: string;
  traceId: string;
  productId: string;
  packId: string | null;
  limitsId: string;
  options: unknown;
  engineVersion: string;
  result: unknown;
  coreC: Uint8Array;
  surfaceC: Blob;
  meanC: Blob;
  coolantC: Blob;
  resultSha256: string;
  outcome: string;
  status: string;
  signedBy: string | null;
  signedAt: When | null;
  decision: string | null;
  signComment: string | null;
  signMeaning: string | null;
  correctsId: string | null;
  createdAt: When;
}

/** ISO 8601 with milliseconds and Z, whatever text form the database kept. */
export function isoInstant(v: When): string {
  const d = v instanceof Date ? v : new Date(v);
  return Number.isNaN(d.getTime()) ? `invalid:${String(v)}` : d.toISOString();
}

const blobHash = (b: Blob) => (b ? sha256Hex(b) : null);

export function traceContent(r: TraceRowContent) {
  return {
    entity: "trace",
    id: r.id,
    name: r.name,
    fileName: r.fileName,
    sha256: r.sha256,
    originalSha256: r.original ? sha256Hex(r.original) : r.sha256,
    series: { timesS: sha256Hex(r.timesS), airC: sha256Hex(r.airC), probeC: blobHash(r.probeC) },
    importSettings: r.importSettings,
    sampleCount: r.sampleCount,
    startAt: isoInstant(r.startAt),
    endAt: isoInstant(r.endAt),
    warnings: r.warnings,
    createdAt: isoInstant(r.createdAt),
  };
}

export function definitionContent(r: DefinitionRowContent) {
  return {
    entity: "definition",
    id: r.id,
    kind: r.kind,
    lineage: r.lineage,
    version: r.version,
    name: r.name,
    bodySha256: sha256Hex(canonicalJson(r.body)),
    sha256: r.sha256,
    createdAt: isoInstant(r.createdAt),
  };
}

/** The sign-off part of a review: decision, signer, time, meaning and comment. */
export function signOffContent(r: ReviewRowContent) {
  return {
    status: r.status,
    decision: r.decision,
    signedBy: r.signedBy,
    signedAt: r.signedAt === null ? null : isoInstant(r.signedAt),
    meaning: r.signMeaning,
    comment: r.signComment,
  };
}

export function reviewContent(r: ReviewRowContent) {
  return {
    entity: "review",
    id: r.id,
    title: r.title,
    traceId: r.traceId,
    productId: r.productId,
    packId: r.packId,
    limitsId: r.limitsId,
    options: r.options,
    engineVersion: r.engineVersion,
    // the whole result, outcome and every rule status included
    result: r.result,
    outcome: r.outcome,
    series: { coreC: sha256Hex(r.coreC), surfaceC: blobHash(r.surfaceC), meanC: blobHash(r.meanC), coolantC: blobHash(r.coolantC) },
    resultSha256: r.resultSha256,
    correctsId: r.correctsId,
    createdAt: isoInstant(r.createdAt),
    signOff: signOffContent(r),
  };
}

export const traceContentHash = (r: TraceRowContent) => sha256Hex(canonicalJson(traceContent(r)));
export const definitionContentHash = (r: DefinitionRowContent) => sha256Hex(canonicalJson(definitionContent(r)));
export const reviewContentHash = (r: ReviewRowContent) => sha256Hex(canonicalJson(reviewContent(r)));
export const signOffContentHash = (r: ReviewRowContent) => sha256Hex(canonicalJson(signOffContent(r)));

/**
 * The shipment tables (issue 15): lanes, the logger register, shipments, their loggers and the links to
 * their reviews. Each row's content is its columns, dates as ISO instants, JSON columns as values, so a
 * row read through Prisma and the same row read raw from the file hash alike.
 */
export const SHIPMENT_TABLES = {
  Lane: { entity: "lane", dates: ["createdAt"], json: [] },
  Logger: { entity: "logger", dates: ["lastCalibrationAt", "nextCalibrationAt", "createdAt", "updatedAt"], json: [] },
  Shipment: { entity: "shipment", dates: ["plannedDepartureAt", "plannedArrivalAt", "actualDepartureAt", "actualArrivalAt", "signedAt", "createdAt"], json: ["result"] },
  ShipmentLogger: { entity: "shipmentLogger", dates: ["createdAt"], json: ["products"] },
  ShipmentReview: { entity: "shipmentReview", dates: ["createdAt"], json: [] },
} as const satisfies Record<string, { entity: string; dates: readonly string[]; json: readonly string[] }>;
export type ShipmentTable = keyof typeof SHIPMENT_TABLES;

export function shipmentRowContent(table: ShipmentTable, row: Record<string, unknown>) {
  const spec = SHIPMENT_TABLES[table];
  const out: Record<string, unknown> = { entity: spec.entity };
  for (const [k, v] of Object.entries(row)) {
    if ((spec.dates as readonly string[]).includes(k)) out[k] = v === null || v === undefined ? null : isoInstant(v as When);
    else if (v instanceof Uint8Array) out[k] = sha256Hex(v);
    else out[k] = v === undefined ? null : v;
  }
  return out;
}

/** SHA-256 of a shipment-table row's canonical content. */
export function shipmentRowContentHash(table: ShipmentTable, row: Record<string, unknown>): string {
  return sha256Hex(canonicalJson(shipmentRowContent(table, row)));
}
