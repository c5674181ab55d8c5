import { db } from "./client";
import { resolvePage, searchText, type PageRequest, type Paged } from "./page";
import { actorsContaining, idsContaining, plainPrefix, SEARCH_MATCH_CAP } from "./textSearch";
import type { AuditEntryRecord } from "../review/audit";
import type { AuditEvent } from "./audit";

export type AuditEntity = AuditEvent["entity"];
export type AuditAction = AuditEvent["action"];

/**
 * Every kind of record the log holds, as the audit page names it. Keyed by AuditEvent's union (lib/db/audit.ts),
 * so a kind added there fails type checking until it is named here: the filter once offered 7 of 16 kinds.
 */
export const AUDIT_ENTITY_WORDS = {
  trace: "trace", definition: "definition", review: "review", run: "run",
  shipment: "shipment", shipmentLogger: "shipment logger", shipmentReview: "shipment review", lane: "lane", logger: "logger",
  monitor: "monitor", alert: "alert", delivery: "alert delivery",
  user: "account", token: "API token", key: "signing key", chain: "audit chain",
} as const satisfies Record<AuditEntity, string>;
export const AUDIT_ENTITIES = Object.keys(AUDIT_ENTITY_WORDS) as AuditEntity[];

/** A kind of record in words (its own name for a kind the log should not hold). */
export function auditEntityWord(entity: string): string {
  return (AUDIT_ENTITY_WORDS as Record<string, string>)[entity] ?? entity;
}

/** Every action, in the order the filter offers them; keyed by AuditEvent's union as above (signature-refused was missing). */
const ACTIONS_IN_ORDER = {
  import: true, create: true, edit: true, rename: true, run: true, cancel: true, sign: true, "signature-refused": true, export: true, verify: true,
  seal: true, readings: true, raise: true, clear: true, deliver: true, resume: true, close: true,
  "sign-in": true, "sign-in-refused": true, "sign-out": true, "set-role": true, "set-password": true, disable: true, enable: true, revoke: true, key: true,
} as const satisfies Record<AuditAction, true>;
export const AUDIT_ACTIONS = Object.keys(ACTIONS_IN_ORDER) as AuditAction[];

export interface AuditFilter {
  entity?: AuditEntity;
  action?: AuditAction;
  /** one object: the exact id of a trace, definition version or review */
  object?: string;
  /** entries at or after this instant */
  from?: Date;
  /** entries before this instant */
  to?: Date;
  /** text search: names and titles of the objects, ids, hashes (their start), the actor */
  q?: string;
}

/** What an entry is about, in words, with where to open it. */
export interface AuditSubject {
  /** the trace's name, "product Ready meal v2", the review's title; null when the object is not found */
  name: string | null;
  /** the definition's kind, for definitions */
  kind?: string;
  href: string | null;
}

export interface AuditRow extends AuditEntryRecord {
  subject: AuditSubject;
  /** the export's format (series.csv, findings.csv, review.json, original), for export entries */
  format: string | null;
}

/** Where a definition version is shown read-only. */
export const definitionHref = (id: string) => `/definitions/${id}`;

/** Ids of the objects whose names or titles contain the text, or whose hashes start with it (newest first, capped per kind). */
async function matchingIds(t: string): Promise<string[]> {
  const hex = /^[0-9a-f]{4,64}$/i.test(t) ? t.toLowerCase() : null;
  const byHash = hex
    ? await Promise.all([
        db.trace.findMany({ where: { sha256: { startsWith: hex } }, select: { id: true }, take: SEARCH_MATCH_CAP }),
        db.definition.findMany({ where: { sha256: { startsWith: hex } }, select: { id: true }, take: SEARCH_MATCH_CAP }),
        db.review.findMany({ where: { resultSha256: { startsWith: hex } }, select: { id: true }, take: SEARCH_MATCH_CAP }),
      ])
    : [];
  const byName = await Promise.all([idsContaining("Trace", t), idsContaining("Definition", t), idsContaining("Review", t, ["title"])]);
  return [...byName.flat(), ...byHash.flat().map((r) => r.id)];
}

async function auditWhere(f: AuditFilter) {
  const t = searchText(f.q);
  const hex = t && /^[0-9a-f]{4,64}$/i.test(t) ? t.toLowerCase() : null;
  const prefix = t ? plainPrefix(t) : null;
  return {
    entity: f.entity,
    action: f.action,
    entityId: f.object,
    at: f.from || f.to ? { gte: f.from, lt: f.to } : undefined,
    ...(t
      ? {
          OR: [
            { entityId: t },
            ...(prefix ? [{ entityId: { startsWith: prefix } }] : []),
            { actor: { in: await actorsContaining(t) } },
            ...(hex ? [{ hash: { startsWith: hex } }] : []),
            ...(/^\d+$/.test(t) ? [{ seq: Number(t) }] : []),
            { entityId: { in: await matchingIds(t) } },
          ],
        }
      : {}),
  };
}

/** Names and links for the objects of a batch of entries, one query per kind of object whatever the batch size. */
async function subjects(entries: ReadonlyArray<{ entity: string; entityId: string; action: string; details: unknown }>): Promise<Map<string, AuditSubject>> {
  const ids = (entity: string) => [...new Set(entries.filter((e) => e.entity === entity).map((e) => e.entityId))];
  const [traces, defs, reviews, monitors, alerts, shipments, lanes, loggers, shipmentLoggers, shipmentReviews] = await Promise.all([
    db.trace.findMany({ where: { id: { in: ids("trace") } }, select: { id: true, name: true } }),
    db.definition.findMany({ where: { id: { in: ids("definition") } }, select: { id: true, name: true, kind: true, version: true } }),
    db.review.findMany({ where: { id: { in: ids("review") } }, select: { id: true, title: true } }),
    db.monitor.findMany({ where: { id: { in: ids("monitor") } }, select: { id: true, name: true } }),
    db.alert.findMany({ where: { id: { in: ids("alert") } }, select: { id: true, kind: true, monitorId: true, monitor: { select: { name: true } } } }),
    db.shipment.findMany({ where: { id: { in: ids("shipment") } }, select: { id: true, reference: true } }),
    db.lane.findMany({ where: { id: { in: ids("lane") } }, select: { id: true, name: true } }),
    db.logger.findMany({ where: { id: { in: ids("logger") } }, select: { id: true, serial: true } }),
    db.shipmentLogger.findMany({ where: { id: { in: ids("shipmentLogger") } }, select: { id: true, shipmentId: true, ordinal: true, position: true } }),
    db.shipmentReview.findMany({ where: { id: { in: ids("shipmentReview") } }, select: { id: true, shipmentId: true, reviewId: true } }),
  ]);
  const [users, tokens] = await Promise.all([
    db.user.findMany({ where: { id: { in: ids("user") } }, select: { id: true, name: true, email: true } }),
    db.apiToken.findMany({ where: { id: { in: ids("token") } }, select: { id: true, name: true, prefix: true } }),
  ]);
  const out = new Map<string, AuditSubject>();
  for (const t of traces) out.set(`trace:${t.id}`, { name: t.name, href: `/traces/${t.id}` });
  for (const d of defs) out.set(`definition:${d.id}`, { name: `${d.name} v${d.version}`, kind: d.kind, href: definitionHref(d.id) });
  for (const r of reviews) out.set(`review:${r.id}`, { name: r.title, href: `/reviews/${r.id}` });
  for (const m of monitors) out.set(`monitor:${m.id}`, { name: m.name, href: `/monitors/${m.id}` });
  for (const a of alerts) out.set(`alert:${a.id}`, { name: `${a.kind} alert, ${a.monitor.name}`, href: `/monitors/${a.monitorId}` });
  for (const s of shipments) out.set(`shipment:${s.id}`, { name: `shipment ${s.reference}`, href: `/shipments/${s.id}` });
  for (const l of lanes) out.set(`lane:${l.id}`, { name: `lane ${l.name}`, href: `/lanes/${l.id}` });
  for (const l of loggers) out.set(`logger:${l.id}`, { name: `logger ${l.serial}`, href: "/loggers" });
  for (const l of shipmentLoggers) out.set(`shipmentLogger:${l.id}`, { name: `shipment logger ${l.ordinal} (${l.position})`, href: `/shipments/${l.shipmentId}` });
  for (const l of shipmentReviews) out.set(`shipmentReview:${l.id}`, { name: `shipment review of ${l.reviewId.slice(0, 8)}…`, href: `/shipments/${l.shipmentId}` });
  // an alert delivery attempt (a "resume" entry's subject): the attempt, its target and the monitor
  const deliveries = await db.alertDelivery.findMany({ where: { id: { in: ids("delivery") } }, select: { id: true, attempt: true, target: true, alert: { select: { monitorId: true, monitor: { select: { name: true } } } } } });
  for (const d of deliveries) out.set(`delivery:${d.id}`, { name: `delivery attempt ${d.attempt} to ${d.target}, ${d.alert.monitor.name}`, href: `/monitors/${d.alert.monitorId}` });
  for (const u of users) out.set(`user:${u.id}`, { name: `${u.name} <${u.email}>`, href: "/users" });
  for (const t of tokens) out.set(`token:${t.id}`, { name: `${t.name} (${t.prefix}…)`, href: "/tokens" });
  // a refused sign-in for an address no account has is recorded under the address typed (lib/services/access.ts)
  for (const e of entries) {
    if (e.entity !== "user" || out.has(`user:${e.entityId}`) || e.action !== "sign-in-refused") continue;
    out.set(`user:${e.entityId}`, { name: `${e.entityId} (no account has this address)`, href: null });
  }
  // a run is not stored (only its cancellation is recorded): named from the entry's own details
  for (const e of entries) {
    if (e.entity !== "run") continue;
    const d = (e.details ?? {}) as { kind?: unknown; title?: unknown };
    out.set(`run:${e.entityId}`, { name: [typeof d.kind === "string" ? d.kind : null, typeof d.title === "string" ? `“${d.title}”` : null].filter(Boolean).join(" ") || null, href: null });
  }
  // a signing key is named by its fingerprint (the entry's id); it has no page
  for (const fp of ids("key")) out.set(`key:${fp}`, { name: `signing key ${fp.slice(0, 16)}…`, href: null });
  return out;
}

async function withSubjects(rows: Array<Omit<AuditEntryRecord, "details"> & { details: unknown }>): Promise<AuditRow[]> {
  const names = await subjects(rows);
  return rows.map((r) => {
    const details = r.details as Record<string, unknown> | null;
    const format = r.action === "export" && details && typeof details.format === "string" ? details.format : null;
    return { ...r, subject: names.get(`${r.entity}:${r.entityId}`) ?? { name: null, href: null }, format };
  });
}

/** One page of the audit log, newest first, with each object's name and link. */
export async function queryAudit(filter: AuditFilter & PageRequest = {}): Promise<Paged<AuditRow>> {
  const where = await auditWhere(filter);
  const total = await db.auditEntry.count({ where });
  const p = resolvePage(filter, total);
  const rows = await db.auditEntry.findMany({ where, orderBy: { seq: "desc" }, skip: p.skip, take: p.pageSize });
  return { rows: await withSubjects(rows), total, page: p.page, pageSize: p.pageSize, pages: p.pages };
}

/**
 * Every entry that matches, oldest first, in batches of `batch` (for the CSV export: the whole log is
 * never held in memory at once).
 */
export async function* auditBatches(filter: AuditFilter = {}, batch = 500): AsyncGenerator<AuditRow[]> {
  const where = await auditWhere(filter);
  let after = 0;
  for (;;) {
    const rows = await db.auditEntry.findMany({ where: { AND: [where, { seq: { gt: after } }] }, orderBy: { seq: "asc" }, take: batch });
    if (rows.length === 0) return;
    yield await withSubjects(rows);
    after = rows[rows.length - 1]!.seq;
    if (rows.length < batch) return;
  }
}

/** The newest entry for one object and action (e.g. the last re-check of a review), or null. */
export async function lastAuditEntry(entityId: string, action: AuditAction): Promise<AuditEntryRecord | null> {
  return db.auditEntry.findFirst({ where: { entityId, action }, orderBy: { seq: "desc" } });
}

/** How many entries the log holds, and the newest one's number and hash (cheap: no re-hashing). */
export async function auditHead(): Promise<{ entries: number; seq: number | null; hash: string | null; at: Date | null }> {
  const [entries, last] = await Promise.all([db.auditEntry.count(), db.auditEntry.findFirst({ orderBy: { seq: "desc" }, select: { seq: true, hash: true, at: true } })]);
  return { entries, seq: last?.seq ?? null, hash: last?.hash ?? null, at: last?.at ?? null };
}
