import { db } from "./client";
import { appendAudit, lockChain } from "./audit";
import { insertApiToken, type ApiTokenRow } from "./apiTokens";
import type { Actor } from "../access/actor";

/** A monitor as stored (without the device token's hash). */
export interface StoredMonitor {
  id: string;
  name: string;
  productId: string;
  packId: string | null;
  limitsId: string;
  shipmentId: string | null;
  serial: string | null;
  model: string;
  alertLeadMin: number;
  airHold: "current" | "mean";
  airHoldCount: number | null;
  webhooks: string[];
  emails: string[];
  webhookSecret: string;
  status: "open" | "closed";
  closedAt: Date | null;
  traceId: string | null;
  reviewId: string | null;
  createdAt: Date;
}

export interface NewMonitor {
  name: string;
  productId: string;
  packId?: string;
  limitsId: string;
  shipmentId?: string;
  serial?: string;
  model: string;
  alertLeadMin: number;
  airHold: "current" | "mean";
  airHoldCount?: number;
  webhooks: string[];
  emails: string[];
  webhookSecret: string;
  deviceTokenSha256: string;
}

type Row = Awaited<ReturnType<typeof db.monitor.findUniqueOrThrow>>;
function toStored(r: Row): StoredMonitor {
  const { deviceTokenSha256: _hidden, ...rest } = r;
  return { ...rest, airHold: r.airHold as StoredMonitor["airHold"], status: r.status as StoredMonitor["status"], webhooks: r.webhooks as string[], emails: r.emails as string[] };
}

/** The device token made with a monitor: an API token with the `device` scope, bound to it. */
export interface NewDeviceToken {
  /** its owner, whose role it acts with */
  userId: string;
  name: string;
  prefix: string;
  tokenSha256: string;
}

/**
 * Stores a new monitor and its "create" entry (the definitions it uses, its alert settings; never the token),
 * and its device token (an ApiToken row bound to it, with its own "create" entry), in one transaction.
 */
export async function createMonitor(m: NewMonitor, device: NewDeviceToken, actor: Actor): Promise<{ monitor: StoredMonitor; token: ApiTokenRow }> {
  return db.$transaction(async (tx) => {
    const row = await tx.monitor.create({ data: { ...m, packId: m.packId ?? null, shipmentId: m.shipmentId ?? null, serial: m.serial ?? null, airHoldCount: m.airHoldCount ?? null } });
    await appendAudit(tx, {
      action: "create",
      entity: "monitor",
      entityId: row.id,
      actor,
      details: { name: m.name, productId: m.productId, packId: m.packId ?? null, limitsId: m.limitsId, shipmentId: m.shipmentId ?? null, serial: m.serial ?? null, model: m.model, alertLeadMin: m.alertLeadMin, airHold: m.airHold, airHoldCount: m.airHoldCount ?? null, webhooks: m.webhooks, emails: m.emails, deviceTokenSha256: m.deviceTokenSha256 },
    });
    const token = await insertApiToken(tx, { ...device, scope: "device", expiresAt: null, monitorId: row.id }, actor);
    return { monitor: toStored(row), token };
  });
}

export async function getMonitor(id: string): Promise<StoredMonitor | null> {
  const row = await db.monitor.findUnique({ where: { id } });
  return row ? toStored(row) : null;
}

/** Whether a monitor has an active device token with this hash (the demo page shows the simulator command when its public token is one). */
export async function monitorHasDeviceToken(id: string, tokenSha256: string): Promise<boolean> {
  return (await db.apiToken.count({ where: { monitorId: id, tokenSha256, scope: "device", revokedAt: null } })) > 0;
}

export interface MonitorListRow extends StoredMonitor {
  readingCount: number;
  openAlerts: number;
  lastReadingAt: Date | null;
}

/** Every monitor, open ones first, newest first, with its reading count, last reading and open alerts. */
export async function listMonitors(): Promise<MonitorListRow[]> {
  const rows = await db.monitor.findMany({ orderBy: [{ status: "desc" }, { createdAt: "desc" }], include: { _count: { select: { readings: true, alerts: { where: { clearedAt: null } } } } } });
  const last = await db.monitorReading.groupBy({ by: ["monitorId"], _max: { tS: true } });
  const lastBy = new Map(last.map((l) => [l.monitorId, l._max.tS]));
  return rows.map(({ _count, ...r }) => {
    const t = lastBy.get(r.id);
    return { ...toStored(r as Row), readingCount: _count.readings, openAlerts: _count.alerts, lastReadingAt: t != null ? new Date(t * 1000) : null };
  });
}

export async function openMonitorIds(): Promise<string[]> {
  return (await db.monitor.findMany({ where: { status: "open" }, select: { id: true } })).map((m) => m.id);
}

export interface StoredReading {
  t_s: number;
  air_C: number;
  probe_C: number | null;
}

/** A monitor's readings in time order. */
export async function monitorReadings(id: string): Promise<StoredReading[]> {
  const rows = await db.monitorReading.findMany({ where: { monitorId: id }, orderBy: { tS: "asc" }, select: { tS: true, airC: true, probeC: true } });
  return rows.map((r) => ({ t_s: r.tS, air_C: r.airC, probe_C: r.probeC }));
}

export interface NewBatch {
  sha256: string;
  format: "json" | "csv";
  readings: StoredReading[];
  duplicates: number;
  conflicts: number;
  refused: number;
}

/** Stores one accepted batch and its readings with a "readings" entry (the body's SHA-256 and the counts), in one transaction. */
export async function storeBatch(monitorId: string, b: NewBatch, actor: Actor): Promise<{ batchId: string }> {
  return db.$transaction(async (tx) => {
    const batch = await tx.monitorBatch.create({ data: { monitorId, sha256: b.sha256, format: b.format, accepted: b.readings.length, duplicates: b.duplicates, conflicts: b.conflicts, refused: b.refused } });
    if (b.readings.length) await tx.monitorReading.createMany({ data: b.readings.map((r) => ({ monitorId, tS: r.t_s, airC: r.air_C, probeC: r.probe_C, batchId: batch.id })) });
    const times = b.readings.map((r) => r.t_s);
    await appendAudit(tx, {
      action: "readings",
      entity: "monitor",
      entityId: monitorId,
      actor,
      details: { batchId: batch.id, sha256: b.sha256, format: b.format, accepted: b.readings.length, duplicates: b.duplicates, conflicts: b.conflicts, refused: b.refused, ...(times.length ? { first: new Date(Math.min(...times) * 1000).toISOString(), last: new Date(Math.max(...times) * 1000).toISOString() } : {}) },
    });
    return { batchId: batch.id };
  });
}

export interface StoredAlert {
  id: string;
  monitorId: string;
  key: string;
  kind: string;
  rule: string | null;
  message: string;
  raisedAt: Date;
  clearedAt: Date | null;
}

export async function openAlerts(monitorId: string): Promise<StoredAlert[]> {
  return db.alert.findMany({ where: { monitorId, clearedAt: null }, orderBy: { raisedAt: "asc" } });
}

/** Raises an alert and records it ("raise"), unless one for the same condition is open (then returns null). */
export async function raiseAlert(monitorId: string, a: { key: string; kind: string; rule: string | null; message: string }, at: Date, actor: Actor): Promise<StoredAlert | null> {
  return db.$transaction(async (tx) => {
    const open = await tx.alert.findFirst({ where: { monitorId, key: a.key, clearedAt: null } });
    if (open) return null;
    const row = await tx.alert.create({ data: { monitorId, ...a, raisedAt: at } });
    await appendAudit(tx, { action: "raise", entity: "alert", entityId: row.id, actor, details: { monitorId, key: a.key, kind: a.kind, rule: a.rule, message: a.message } }, at);
    return row;
  });
}

/** Clears an open alert and records it ("clear"); null when it was already cleared. */
export async function clearAlert(alertId: string, at: Date, actor: Actor): Promise<StoredAlert | null> {
  return db.$transaction(async (tx) => {
    const open = await tx.alert.findFirst({ where: { id: alertId, clearedAt: null } });
    if (!open) return null;
    const row = await tx.alert.update({ where: { id: alertId }, data: { clearedAt: at } });
    await appendAudit(tx, { action: "clear", entity: "alert", entityId: alertId, actor, details: { monitorId: row.monitorId, key: row.key } }, at);
    return row;
  });
}

export interface DeliveryAttempt {
  alertId: string;
  event: "raised" | "cleared";
  channel: "webhook" | "email";
  target: string;
  attempt: number;
  at: Date;
  ok: boolean;
  httpStatus?: number;
  error?: string;
  nextAt?: Date;
}

/** Logs one delivery attempt with a "deliver" entry; returns the attempt's row id. */
export async function logDelivery(d: DeliveryAttempt, actor: Actor): Promise<string> {
  return db.$transaction(async (tx) => {
    const row = await tx.alertDelivery.create({ data: { ...d, httpStatus: d.httpStatus ?? null, error: d.error ?? null, nextAt: d.nextAt ?? null } });
    await appendAudit(tx, { action: "deliver", entity: "alert", entityId: d.alertId, actor, details: { deliveryId: row.id, event: d.event, channel: d.channel, target: d.target, attempt: d.attempt, ok: d.ok, httpStatus: d.httpStatus ?? null, error: d.error ?? null } }, d.at);
    return row.id;
  });
}

/**
 * Takes up the retry that attempt row `deliveryId` scheduled, after the process that scheduled it stopped: one
 * "resume" audit entry per attempt row, checked and appended under the audit chain's lock, so of several
 * instances sweeping at once exactly one gets true. (Attempt rows are immutable, so the claim is an entry.)
 */
export async function claimDeliveryRetry(d: { id: string; alertId: string; attempt: number }, actor: Actor): Promise<boolean> {
  return db.$transaction(async (tx) => {
    await lockChain(tx);
    if ((await tx.auditEntry.count({ where: { action: "resume", entity: "delivery", entityId: d.id } })) > 0) return false;
    await appendAudit(tx, { action: "resume", entity: "delivery", entityId: d.id, actor, details: { alertId: d.alertId, attempt: d.attempt + 1 } });
    return true;
  });
}

/** Whether the retry that attempt row `deliveryId` scheduled was taken up elsewhere (claimDeliveryRetry). */
export async function deliveryRetryTaken(deliveryId: string): Promise<boolean> {
  return (await db.auditEntry.count({ where: { action: "resume", entity: "delivery", entityId: deliveryId } })) > 0;
}

/**
 * Attempts whose retry fell due in [since, before) and was neither made (no row for the next attempt) nor taken
 * up: their process stopped while waiting.
 */
export async function overdueDeliveryRetries(since: Date, before: Date): Promise<Array<{ id: string; alertId: string; event: string; channel: string; target: string; attempt: number; nextAt: Date }>> {
  const due = await db.alertDelivery.findMany({ where: { nextAt: { gte: since, lt: before } }, orderBy: { nextAt: "asc" }, take: 500, select: { id: true, alertId: true, event: true, channel: true, target: true, attempt: true, nextAt: true } });
  if (due.length === 0) return [];
  // three queries per sweep whatever the number due (the sweep runs every few seconds): the attempts of their
  // alerts, and the take-ups already recorded
  const key = (d: { alertId: string; event: string; channel: string; target: string }, attempt: number) => `${d.alertId}\u0000${d.event}\u0000${d.channel}\u0000${d.target}\u0000${attempt}`;
  const made = new Set((await db.alertDelivery.findMany({ where: { alertId: { in: [...new Set(due.map((d) => d.alertId))] } }, select: { alertId: true, event: true, channel: true, target: true, attempt: true } })).map((d) => key(d, d.attempt)));
  const taken = new Set((await db.auditEntry.findMany({ where: { action: "resume", entity: "delivery", entityId: { in: due.map((d) => d.id) } }, select: { entityId: true } })).map((e) => e.entityId));
  return due.filter((d) => !made.has(key(d, d.attempt + 1)) && !taken.has(d.id)).map((d) => ({ ...d, nextAt: d.nextAt! }));
}

export async function getAlert(id: string): Promise<StoredAlert | null> {
  return db.alert.findUnique({ where: { id } });
}

export interface AlertWithDeliveries extends StoredAlert {
  deliveries: Array<{ id: string; event: string; channel: string; target: string; attempt: number; at: Date; ok: boolean; httpStatus: number | null; error: string | null; nextAt: Date | null }>;
}

/** A monitor's alerts, newest first, with every delivery attempt. */
export async function alertHistory(monitorId: string): Promise<AlertWithDeliveries[]> {
  return db.alert.findMany({ where: { monitorId }, orderBy: { raisedAt: "desc" }, include: { deliveries: { orderBy: [{ at: "asc" }, { attempt: "asc" }] } } });
}

/** Open alerts over every monitor (the navigation badge and the live list). */
export async function openAlertList(): Promise<Array<StoredAlert & { monitorName: string }>> {
  const rows = await db.alert.findMany({ where: { clearedAt: null }, orderBy: { raisedAt: "desc" }, include: { monitor: { select: { name: true } } } });
  return rows.map(({ monitor, ...a }) => ({ ...a, monitorName: monitor.name }));
}

export async function openAlertCount(): Promise<number> {
  return db.alert.count({ where: { clearedAt: null } });
}

/** Closes a monitor, pointing at the trace and review made from its readings ("close"). */
export async function closeMonitorRow(id: string, traceId: string, reviewId: string, actor: Actor): Promise<void> {
  await db.$transaction(async (tx) => {
    const m = await tx.monitor.findUniqueOrThrow({ where: { id } });
    if (m.status !== "open") throw new Error("the monitor is already closed");
    await tx.monitor.update({ where: { id }, data: { status: "closed", closedAt: new Date(), traceId, reviewId } });
    await appendAudit(tx, { action: "close", entity: "monitor", entityId: id, actor, details: { traceId, reviewId } });
  });
}

/** When each batch with accepted readings arrived, epoch s, oldest first. */
export async function monitorArrivals(id: string): Promise<number[]> {
  const rows = await db.monitorBatch.findMany({ where: { monitorId: id, accepted: { gt: 0 } }, orderBy: { receivedAt: "asc" }, select: { receivedAt: true } });
  return rows.map((b) => b.receivedAt.getTime() / 1000);
}

/** The receipt time of a stored batch. */
export async function batchReceivedAt(batchId: string): Promise<Date> {
  return (await db.monitorBatch.findUniqueOrThrow({ where: { id: batchId }, select: { receivedAt: true } })).receivedAt;
}
