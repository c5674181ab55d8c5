// Storage of shipments, lanes and the logger register (issue 15). Every write appends its audit entry in
// the same transaction; a signed shipment is final (triggers in migration 20261202130000_shipments).
import { randomUUID } from "node:crypto";
import { db } from "./client";
import { appendAudit, type Tx } from "./audit";
import { shipmentRowContentHash } from "../shipment/content";
import { reviewContentHash } from "../review/content";
import type { Outcome } from "../exposure/rules";
import { COMMENT_REQUIRED_MESSAGE, DEFAULT_SIGN_MEANING, MIN_DIFFERING_COMMENT_CHARS, insertReview, type NewReview } from "./reviews";
import type { Actor } from "../access/actor";

export interface ShipmentProductEntry {
  productId: string;
  packId?: string;
  governing?: boolean;
}

// ---- lanes -------------------------------------------------------------------------------------------

export async function createLane(l: { name: string; origin: string; destination: string }, actor: Actor) {
  return db.$transaction(async (tx) => {
    const row = await tx.lane.create({ data: l });
    await appendAudit(tx, { action: "create", entity: "lane", entityId: row.id, actor, details: { name: row.name, origin: row.origin, destination: row.destination }, contentSha256: shipmentRowContentHash("Lane", row) });
    return row;
  });
}

export async function listLanes() {
  return db.lane.findMany({ orderBy: { name: "asc" }, include: { _count: { select: { shipments: true } } } });
}

export async function getLane(id: string) {
  return db.lane.findUnique({ where: { id } });
}

export async function laneByName(name: string) {
  return db.lane.findUnique({ where: { name } });
}

// ---- logger register ---------------------------------------------------------------------------------

export interface LoggerInput {
  serial: string;
  description: string;
  accuracyK: number;
  lastCalibrationAt?: Date | null;
  nextCalibrationAt?: Date | null;
}

export async function createLogger(l: LoggerInput, actor: Actor, tx0?: Tx) {
  const write = async (tx: Tx) => {
    const row = await tx.logger.create({ data: { ...l, lastCalibrationAt: l.lastCalibrationAt ?? null, nextCalibrationAt: l.nextCalibrationAt ?? null } });
    await appendAudit(tx, { action: "create", entity: "logger", entityId: row.id, actor, details: { serial: row.serial, accuracyK: row.accuracyK, nextCalibrationAt: row.nextCalibrationAt?.toISOString() ?? null }, contentSha256: shipmentRowContentHash("Logger", row) });
    return row;
  };
  return tx0 ? write(tx0) : db.$transaction(write);
}

/** A new calibration or description: the row changes, the entry keeps what it was and what it became. */
export async function updateLogger(id: string, l: Omit<LoggerInput, "serial">, actor: Actor) {
  return db.$transaction(async (tx) => {
    const before = await tx.logger.findUniqueOrThrow({ where: { id } });
    const row = await tx.logger.update({ where: { id }, data: { ...l, updatedAt: new Date() } });
    await appendAudit(tx, {
      action: "edit", entity: "logger", entityId: id, actor,
      details: { serial: row.serial, before: { description: before.description, accuracyK: before.accuracyK, lastCalibrationAt: before.lastCalibrationAt?.toISOString() ?? null, nextCalibrationAt: before.nextCalibrationAt?.toISOString() ?? null }, previousContentSha256: shipmentRowContentHash("Logger", before) },
      contentSha256: shipmentRowContentHash("Logger", row),
    });
    return row;
  });
}

export async function listLoggers() {
  return db.logger.findMany({ orderBy: { serial: "asc" } });
}

export async function loggersBySerial(serials: readonly string[]) {
  return db.logger.findMany({ where: { serial: { in: [...serials] } } });
}

export async function getLogger(id: string) {
  return db.logger.findUnique({ where: { id } });
}

// ---- shipments ---------------------------------------------------------------------------------------

export interface ShipmentInput {
  reference: string;
  laneId?: string | null;
  carrier?: string | null;
  vehicle?: string | null;
  plannedDepartureAt?: Date | null;
  plannedArrivalAt?: Date | null;
  actualDepartureAt?: Date | null;
  actualArrivalAt?: Date | null;
  notes?: string | null;
  limitsId: string;
}

export interface ShipmentLoggerInput {
  position: string;
  serial?: string | null;
  fileNamePattern?: string | null;
  products: ShipmentProductEntry[];
}

export async function createShipment(s: ShipmentInput, loggers: ShipmentLoggerInput[], actor: Actor): Promise<string> {
  return db.$transaction(async (tx) => {
    const row = await tx.shipment.create({ data: { ...s, laneId: s.laneId ?? null } });
    await appendAudit(tx, { action: "create", entity: "shipment", entityId: row.id, actor, details: { reference: row.reference, laneId: row.laneId, limitsId: row.limitsId }, contentSha256: shipmentRowContentHash("Shipment", row) });
    for (const [i, l] of loggers.entries()) await insertLogger(tx, row.id, i + 1, l, actor);
    return row.id;
  });
}

async function insertLogger(tx: Tx, shipmentId: string, ordinal: number, l: ShipmentLoggerInput, actor: Actor) {
  const row = await tx.shipmentLogger.create({ data: { shipmentId, ordinal, position: l.position, serial: l.serial ?? null, fileNamePattern: l.fileNamePattern ?? null, products: l.products as unknown as object } });
  await appendAudit(tx, { action: "create", entity: "shipmentLogger", entityId: row.id, actor, details: { shipmentId, ordinal, position: row.position, serial: row.serial, products: l.products as unknown as object }, contentSha256: shipmentRowContentHash("ShipmentLogger", row) });
  return row;
}

/** Adds logger entries to an open shipment. */
export async function addShipmentLoggers(shipmentId: string, loggers: ShipmentLoggerInput[], actor: Actor) {
  return db.$transaction(async (tx) => {
    const n = await tx.shipmentLogger.count({ where: { shipmentId } });
    const rows = [];
    for (const [i, l] of loggers.entries()) rows.push(await insertLogger(tx, shipmentId, n + i + 1, l, actor));
    return rows;
  });
}

/** Attaches stored traces to logger entries (the confirmed matching of a batch upload), all or none. */
export async function attachTraces(shipmentId: string, links: ReadonlyArray<{ shipmentLoggerId: string; traceId: string }>, actor: Actor) {
  return db.$transaction(async (tx) => {
    for (const l of links) {
      const entry = await tx.shipmentLogger.findUnique({ where: { id: l.shipmentLoggerId } });
      if (!entry || entry.shipmentId !== shipmentId) throw new Error(`logger entry ${l.shipmentLoggerId} is not part of this shipment`);
      const row = await tx.shipmentLogger.update({ where: { id: l.shipmentLoggerId }, data: { traceId: l.traceId } });
      await appendAudit(tx, { action: "edit", entity: "shipmentLogger", entityId: row.id, actor, details: { shipmentId, position: row.position, traceId: l.traceId, previousTraceId: entry.traceId }, contentSha256: shipmentRowContentHash("ShipmentLogger", row) });
    }
  });
}

/**
 * A shipment review run in one transaction: every review with its audit entry, the links saying which
 * logger and product each stands for, and the shipment's outcome. A failure stores none of it.
 */
export async function recordShipmentRun(shipmentId: string, runId: string, items: ReadonlyArray<{ shipmentLoggerId: string; productId: string; review: NewReview }>, outcome: Outcome, result: unknown, actor: Actor): Promise<string[]> {
  return db.$transaction(async (tx) => {
    const reviewIds: string[] = [];
    for (const item of items) {
      const reviewId = await insertReview(tx, item.review);
      reviewIds.push(reviewId);
      const link = await tx.shipmentReview.create({ data: { shipmentId, runId, shipmentLoggerId: item.shipmentLoggerId, productId: item.productId, reviewId } });
      await appendAudit(tx, { action: "create", entity: "shipmentReview", entityId: link.id, actor, details: { shipmentId, runId, shipmentLoggerId: item.shipmentLoggerId, productId: item.productId, reviewId }, contentSha256: shipmentRowContentHash("ShipmentReview", link) });
    }
    // exact JSON text (Prisma's Json write rounds some doubles; see insertDefinition)
    await tx.$executeRaw`UPDATE "Shipment" SET "outcome" = ${outcome}, "result" = ${JSON.stringify(result)} WHERE "id" = ${shipmentId}`;
    const row = await tx.shipment.findUniqueOrThrow({ where: { id: shipmentId } });
    await appendAudit(tx, { action: "run", entity: "shipment", entityId: shipmentId, actor, details: { runId, outcome, reviews: reviewIds }, contentSha256: shipmentRowContentHash("Shipment", row) });
    return reviewIds;
  });
}

export type ShipmentSignOutcome = { ok: true } | { ok: false; reason: "not-found" | "signed" | "not-run" | "comment-required"; message: string };

/**
 * One sign-off for the load: the shipment and every review of its latest run are signed in one
 * transaction, each with its own audit entry. Each review records the shipment's decision, with a comment
 * naming the shipment (and the review's own suggestion when it differs), so every review says why.
 */
export async function signShipment(id: string, s: { reviewer: string; decision: Outcome; comment?: string; meaning?: string }, actor: Actor): Promise<ShipmentSignOutcome> {
  return db.$transaction(async (tx) => {
    const row = await tx.shipment.findUnique({ where: { id } });
    if (!row) return { ok: false, reason: "not-found", message: "that shipment does not exist" };
    if (row.status === "signed") return { ok: false, reason: "signed", message: "this shipment is already signed off" };
    if (!row.outcome) return { ok: false, reason: "not-run", message: "run the shipment review before signing it off" };
    if (s.decision !== row.outcome && (s.comment ?? "").trim().length < MIN_DIFFERING_COMMENT_CHARS) return { ok: false, reason: "comment-required", message: COMMENT_REQUIRED_MESSAGE };
    const links = await latestRunLinks(tx, id);
    const signedAt = new Date();
    const meaning = s.meaning ?? `${DEFAULT_SIGN_MEANING}, for shipment ${row.reference} as a whole`;
    for (const l of links) {
      const r = await tx.review.findUniqueOrThrow({ where: { id: l.reviewId }, select: { status: true, outcome: true } });
      if (r.status === "signed") continue; // signed on its own before: that signature stands
      const comment = [`Signed with shipment ${row.reference} (shipment decision: ${s.decision}; this review suggested ${r.outcome}).`, s.comment?.trim()].filter(Boolean).join(" ");
      const signed = await tx.review.update({ where: { id: l.reviewId }, data: { status: "signed", signedBy: s.reviewer, signedAt, decision: s.decision, signComment: comment, signMeaning: meaning } });
      await appendAudit(tx, { action: "sign", entity: "review", entityId: l.reviewId, actor, details: { decision: s.decision, suggested: r.outcome, comment, meaning, signedAt: signedAt.toISOString(), shipment: id }, contentSha256: reviewContentHash(signed) }, signedAt);
    }
    const signed = await tx.shipment.update({ where: { id }, data: { status: "signed", signedBy: s.reviewer, signedAt, decision: s.decision, signComment: s.comment?.trim() || null, signMeaning: meaning } });
    await appendAudit(tx, { action: "sign", entity: "shipment", entityId: id, actor, details: { decision: s.decision, suggested: row.outcome, comment: s.comment ?? null, meaning, signedAt: signedAt.toISOString(), reviews: links.map((l) => l.reviewId) }, contentSha256: shipmentRowContentHash("Shipment", signed) }, signedAt);
    return { ok: true };
  });
}

async function latestRunLinks(tx: Tx | typeof db, shipmentId: string) {
  const last = await tx.shipmentReview.findFirst({ where: { shipmentId }, orderBy: { createdAt: "desc" }, select: { runId: true } });
  if (!last) return [];
  return tx.shipmentReview.findMany({ where: { shipmentId, runId: last.runId }, orderBy: { createdAt: "asc" } });
}

export async function getShipment(id: string) {
  const row = await db.shipment.findUnique({
    where: { id },
    include: {
      lane: true,
      limits: true,
      loggers: { orderBy: { ordinal: "asc" }, include: { trace: { select: { id: true, name: true, fileName: true, sha256: true, sampleCount: true, startAt: true, endAt: true, importSettings: true } } } },
    },
  });
  if (!row) return null;
  const links = await latestRunLinks(db, id);
  const reviews = await db.review.findMany({ where: { id: { in: links.map((l) => l.reviewId) } }, select: { id: true, title: true, outcome: true, status: true, decision: true, productId: true, result: true, coreC: true, traceId: true } });
  const byId = new Map(reviews.map((r) => [r.id, r]));
  return {
    ...row,
    loggers: row.loggers.map((l) => ({ ...l, products: l.products as unknown as ShipmentProductEntry[] })),
    reviews: links.map((l) => ({ ...l, review: byId.get(l.reviewId)! })),
  };
}
export type StoredShipment = NonNullable<Awaited<ReturnType<typeof getShipment>>>;

export async function listShipments(filter: { laneId?: string } = {}) {
  return db.shipment.findMany({
    where: { laneId: filter.laneId },
    orderBy: { createdAt: "desc" },
    take: 200,
    include: { lane: { select: { id: true, name: true } }, _count: { select: { loggers: true } } },
  });
}

/** Whether a shipment review run was stored under this id (a queued run retried after its store committed). */
export async function shipmentRunStored(runId: string): Promise<boolean> {
  return (await db.shipmentReview.count({ where: { runId } })) > 0;
}

/** A fresh run id (a shipment review run). */
export const newRunId = () => randomUUID();
