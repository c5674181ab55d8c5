import { createHash, randomBytes, timingSafeEqual } from "node:crypto";
import { z } from "zod";
import { alertChanges, alertConditions, forecast, parseReadingsCsv, parseReadingsJson, staleness, type Forecast, type RuleRunning } from "../live";
import { modelChoiceSchema } from "../thermal/definitions";
import { sha256Hex } from "../trace";
import { clearAlert, closeMonitorRow, createMonitor, getMonitor, monitorReadings, monitorTokenHash, openAlerts, openMonitorIds, raiseAlert, storeBatch, batchReceivedAt, type StoredMonitor } from "../db/monitors";
import { deliverAlert, resumeDeliveries } from "./alertDelivery";
import { dropLiveEntry, liveEntry, loadMonitorDefinitions, notifyMonitorChange, withMonitor, type LiveEntry } from "./liveRegistry";
import { importAndStoreTrace } from "./traces";
import { runAndStoreReview } from "./reviews";
import type { Actor } from "../access/actor";

const text = (what: string, max: number) => z.string({ error: `${what} must be text` }).trim().min(1, { message: `${what} is empty` }).max(max, { message: `${what} is longer than ${max} characters` });

/** POST /api/v1/monitors and the create form: the issue's fields, with the forecast's air as an optional choice. */
export const createMonitorSchema = z.strictObject({
  name: text("name", 160),
  product_id: text("product_id", 60),
  pack_id: text("pack_id", 60).optional(),
  limits_id: text("limits_id", 60),
  shipment_id: text("shipment_id", 120).optional(),
  serial: text("serial", 120).optional(),
  model: modelChoiceSchema.default("auto"),
  alert: z.strictObject({
    /** a forecast alert is raised when the limit is forecast within this many minutes (0 to 7 days) */
    lead_min: z.number({ error: "alert.lead_min must be a number of minutes" }).finite().min(0, { message: "alert.lead_min must be 0 min or more" }).max(10_080, { message: "alert.lead_min must be at most 10 080 min (7 days)" }),
    webhooks: z.array(z.url({ protocol: /^https?$/, message: "each webhook must be an http(s) URL" })).max(10, { message: "at most 10 webhooks" }).default([]),
    emails: z.array(z.email({ message: "each e-mail must be an address like name@example.org" })).max(20, { message: "at most 20 e-mail addresses" }).default([]),
  }, { error: "alert is required: {\"lead_min\": minutes}" }),
  /** the air the forecast holds: the last reading's ("current"), or the mean of the last `last` readings */
  forecast_air: z.strictObject({ hold: z.enum(["current", "mean"]), last: z.number().int().min(2).max(1000).optional() }).optional(),
});
export type CreateMonitorInput = z.input<typeof createMonitorSchema>;

export type CreateMonitorOutcome = { ok: true; id: string; device_token: string } | { ok: false; field: string; message: string };

/** Readings may carry times up to this far ahead of the server's clock (clocks drift; zones get mixed up), s. */
export const FUTURE_TOLERANCE_S = 24 * 3600;

const hashToken = (token: string) => createHash("sha256").update(token, "utf8").digest("hex");

/** Creates a monitor; the device token is returned once and only its hash is kept. */
export async function createMonitorService(input: unknown, actor: Actor, fixedToken?: string): Promise<CreateMonitorOutcome> {
  const parsed = createMonitorSchema.safeParse(input);
  if (!parsed.success) {
    const i = parsed.error.issues[0]!;
    const field = i.path.join(".");
    return { ok: false, field: field || "body", message: field && !i.message.startsWith(field) ? `${field}: ${i.message}` : i.message };
  }
  const b = parsed.data;
  const defs = await loadMonitorDefinitions({ productId: b.product_id, packId: b.pack_id ?? null, limitsId: b.limits_id });
  if (!defs.ok) return { ok: false, field: defs.field, message: `${defs.field}: ${defs.message}` };
  if ((b.model === "conduction" || b.model === "conduction-1d") && (!defs.product.shape || (!defs.product.composition && defs.product.properties?.k_W_mK === undefined))) {
    return { ok: false, field: "model", message: "model: the conduction model needs the product's shape and conductivity" };
  }
  // a fixed token only for the demo monitor (lib/services/demoNames.ts), whose token is public
  const device_token = fixedToken ?? `cmd_${randomBytes(24).toString("base64url")}`;
  const m = await createMonitor(
    {
      name: b.name, productId: b.product_id, packId: b.pack_id, limitsId: b.limits_id, shipmentId: b.shipment_id, serial: b.serial, model: b.model,
      alertLeadMin: b.alert.lead_min, airHold: b.forecast_air?.hold ?? "current", airHoldCount: b.forecast_air?.hold === "mean" ? (b.forecast_air.last ?? 6) : undefined,
      webhooks: b.alert.webhooks, emails: b.alert.emails, webhookSecret: randomBytes(32).toString("hex"), deviceTokenSha256: hashToken(device_token),
    },
    actor,
  );
  return { ok: true, id: m.id, device_token };
}

/**
 * Whether a request's bearer token is this monitor's device token. Until API tokens (with the `device` scope
 * bound to a monitor) are on main, the monitor keeps its own token's hash.
 */
export async function deviceTokenMatches(monitorId: string, authorization: string | null): Promise<boolean> {
  const m = /^Bearer\s+(\S+)$/i.exec(authorization ?? "");
  if (!m) return false;
  const stored = await monitorTokenHash(monitorId);
  if (!stored) return false;
  const a = Buffer.from(hashToken(m[1]!), "hex"), b = Buffer.from(stored, "hex");
  return a.length === b.length && timingSafeEqual(a, b);
}

/** The state as GET /api/v1/monitors/{id} gives it (the issue's fields, exactly). */
export interface MonitorStateJson {
  id: string;
  last_reading: { t: string; air_C: number } | null;
  core_C: number | null;
  surface_C?: number;
  rules: Array<{ id: string; status_so_far: RuleRunning["status_so_far"]; cumulative_min: number; remaining_min?: number }>;
  forecast: { assumed_air_C: number; minutes_to_limit: number | null; limit_rule: string | null; horizon_min: number; reason: string } | null;
  stale: boolean;
}

/** Everything the live page shows, computed from the live entry at `now`. */
export interface MonitorView {
  entry: LiveEntry;
  rules: RuleRunning[];
  forecast: Forecast | null;
  stale: ReturnType<typeof staleness>;
}

export function viewOf(entry: LiveEntry, now: Date): MonitorView {
  const rules = entry.live.rules();
  const fc = entry.live.length ? forecast(entry.live, entry.hold) : null;
  return { entry, rules, forecast: fc, stale: staleOf(entry, now) };
}

/** Staleness on the server's clock: the silence since the last delivery against the usual delivery interval, floored by the readings' own interval. */
function staleOf(entry: LiveEntry, now: Date): ReturnType<typeof staleness> {
  return staleness(entry.arrivals_s, now.getTime() / 1000, { reading_t_s: entry.live.t_s });
}

export function stateJson(v: MonitorView): MonitorStateJson {
  const { live } = v.entry;
  const n = live.length;
  const exact = live.model?.path === "exact";
  return {
    id: v.entry.monitor.id,
    last_reading: n ? { t: new Date(live.t_s[n - 1]! * 1000).toISOString(), air_C: live.air_C[n - 1]! } : null,
    core_C: n ? live.core_C[n - 1]! : null,
    ...(n && !exact ? { surface_C: live.surface_C[n - 1]! } : {}),
    rules: v.rules.map((r) => ({ id: r.id, status_so_far: r.status_so_far, cumulative_min: r.cumulative_min, ...(r.remaining_min !== undefined ? { remaining_min: r.remaining_min } : {}) })),
    forecast: v.forecast ? { assumed_air_C: v.forecast.assumed_air_C, minutes_to_limit: v.forecast.minutes_to_limit, limit_rule: v.forecast.limit_rule, horizon_min: v.forecast.horizon_min, reason: v.forecast.reason } : null,
    stale: v.stale.stale,
  };
}

export async function monitorView(id: string, now = new Date()): Promise<MonitorView | null> {
  if (!(await getMonitor(id))) return null;
  return viewOf(await liveEntry(id), now);
}

/**
 * Raises alerts whose condition holds and has none open, clears open ones whose condition ended (both
 * audited), and sends each change to the webhooks and e-mails in the background.
 */
export async function evaluateAlerts(entry: LiveEntry, now: Date, actor: Actor = { kind: "system", what: "alerts" }): Promise<{ raised: string[]; cleared: string[] }> {
  const v = viewOf(entry, now);
  const open = await openAlerts(entry.monitor.id);
  const conds = entry.monitor.status === "open" ? alertConditions(v.rules, v.forecast, v.stale, entry.monitor.alertLeadMin, open.map((a) => a.key)) : [];
  const { raise, clear } = alertChanges(conds, open.map((a) => a.key));
  const raised: string[] = [], cleared: string[] = [];
  for (const c of raise) {
    const a = await raiseAlert(entry.monitor.id, c, now, actor);
    if (a) {
      raised.push(c.key);
      deliverAlert(entry.monitor, a, "raised");
    }
  }
  for (const key of clear) {
    const a = await clearAlert(open.find((o) => o.key === key)!.id, now, actor);
    if (a) {
      cleared.push(key);
      deliverAlert(entry.monitor, a, "cleared");
    }
  }
  if (raised.length || cleared.length) notifyMonitorChange(entry.monitor.id);
  return { raised, cleared };
}

export type ReadingsOutcome =
  | { ok: true; status: 200; body: { accepted: number; duplicates: number; conflicts: Array<{ index: number; t: string; reason: string }>; refused: Array<{ index: number; reason: string }>; batch: { id: string; sha256: string } | null } }
  | { ok: false; status: 400 | 404 | 409 | 413 | 422; title: string; detail: string; refused?: Array<{ index: number; reason: string }> };

/**
 * Takes a batch of readings (JSON or CSV). Bad readings are refused by index with the reason; then nothing is
 * stored unless the client asked for partial acceptance. Readings at a stored time are ignored when equal and
 * reported as conflicts when different. The accepted readings are stored with the body's SHA-256 (audited),
 * then the live state advances from the first reading they affect and the alerts are re-evaluated.
 */
export async function postReadings(id: string, body: Uint8Array, contentType: string, partial: boolean, actor: Actor, now = () => new Date()): Promise<ReadingsOutcome> {
  const monitor = await getMonitor(id);
  if (!monitor) return { ok: false, status: 404, title: "No such monitor", detail: `no monitor ${id}` };
  if (monitor.status !== "open") return { ok: false, status: 409, title: "Monitor closed", detail: "this monitor is closed and takes no more readings" };
  const textBody = new TextDecoder("utf-8", { fatal: false }).decode(body);
  const csv = /^text\/csv\b/i.test(contentType);
  if (!csv && !/^application\/json\b/i.test(contentType)) return { ok: false, status: 400, title: "Unsupported body", detail: "send application/json ({\"readings\": [...]}) or text/csv (t,air_C[,probe_C])" };
  const parsed = csv ? parseReadingsCsv(textBody) : parseReadingsJson(textBody);
  if (!parsed.ok) return { ok: false, status: 400, title: "Bad readings body", detail: parsed.message };
  const sha256 = sha256Hex(body);
  return withMonitor(id, async () => {
    const entry = await liveEntry(id);
    // a reading from the future would push the late window ahead and make every true reading "too late"
    const latest_s = now().getTime() / 1000 + FUTURE_TOLERANCE_S;
    const refused = [...parsed.parsed.refused];
    const valid = parsed.parsed.valid.filter((v) => {
      if (v.reading.t_s <= latest_s) return true;
      refused.push({ index: v.index, reason: `t is more than ${FUTURE_TOLERANCE_S / 3600} h ahead of the server's clock: is the logger's clock set?` });
      return false;
    });
    const outcomes = entry.live.classify(valid.map((v) => v.reading));
    const conflicts: Array<{ index: number; t: string; reason: string }> = [];
    let duplicates = 0;
    const accepted: typeof valid = [];
    outcomes.forEach((o, k) => {
      const v = valid[k]!;
      if (o.status === "added") accepted.push(v);
      else if (o.status === "duplicate") duplicates++;
      else if (o.status === "conflict") conflicts.push({ index: v.index, t: new Date(v.reading.t_s * 1000).toISOString(), reason: o.reason });
      else refused.push({ index: v.index, reason: o.reason });
    });
    refused.sort((a, b) => a.index - b.index);
    if (refused.length && !partial) {
      return { ok: false, status: 422, title: "Readings refused", detail: `${refused.length} reading(s) refused (first: index ${refused[0]!.index}: ${refused[0]!.reason}); nothing was stored. Fix them, or send ?partial=true to keep the rest.`, refused };
    }
    let batch: { id: string; sha256: string } | null = null;
    if (accepted.length) {
      const stored = await storeBatch(id, { sha256, format: csv ? "csv" : "json", readings: accepted.map((v) => ({ t_s: v.reading.t_s, air_C: v.reading.air_C, probe_C: v.reading.probe_C ?? null })), duplicates, conflicts: conflicts.length, refused: refused.length }, actor);
      batch = { id: stored.batchId, sha256 };
      entry.live.add(accepted.map((v) => v.reading));
      entry.arrivals_s.push((await batchReceivedAt(stored.batchId)).getTime() / 1000);
      notifyMonitorChange(id);
      await evaluateAlerts(entry, now());
    }
    return { ok: true, status: 200, body: { accepted: accepted.length, duplicates, conflicts, refused, batch } };
  });
}

/** Re-evaluates every open monitor at `now` (staleness needs a clock; readings do not come to say they stopped), and resumes alert deliveries whose process stopped. */
export async function sweepMonitors(now = new Date()): Promise<void> {
  await resumeDeliveries(now);
  for (const id of await openMonitorIds()) {
    await withMonitor(id, async () => {
      const entry = await liveEntry(id);
      // only staleness changes with the clock alone: re-judge (rules over the whole history) only when it did
      const stale = staleOf(entry, now).stale;
      const open = (await openAlerts(id)).some((a) => a.key === "stale");
      if (stale !== open) await evaluateAlerts(entry, now);
    });
  }
}

const g = globalThis as unknown as { __corelagSweep?: NodeJS.Timeout };
/** Every SWEEP_S seconds in a server process, once started (the first monitor request starts it). */
export const SWEEP_S = 5;
export function ensureSweeper(): void {
  if (g.__corelagSweep) return;
  g.__corelagSweep = setInterval(() => {
    sweepMonitors().catch((e) => console.error("monitor sweep failed:", e));
  }, SWEEP_S * 1000);
  g.__corelagSweep.unref?.();
}

/** The readings as the CSV file a closed monitor stores (ISO times in UTC, numbers as stored, shortest form). */
export function readingsCsv(readings: ReadonlyArray<{ t_s: number; air_C: number; probe_C: number | null }>): string {
  const probe = readings.some((r) => r.probe_C !== null);
  const lines = [probe ? "t,air_C,probe_C" : "t,air_C", ...readings.map((r) => `${new Date(r.t_s * 1000).toISOString()},${r.air_C}${probe ? `,${r.probe_C ?? ""}` : ""}`)];
  return lines.join("\n") + "\n";
}

/** The import options that read `readingsCsv` back exactly (every reading inside the plausible range of a monitor reading). */
export function readingsImportOptions(hasProbe: boolean) {
  return { delimiter: "," as const, headerRow: 1, timeColumn: "t", airColumn: "air_C", ...(hasProbe ? { productColumn: "probe_C" } : {}), unit: "C" as const, decimal: "." as const, plausibleMin_C: -100, plausibleMax_C: 200 };
}

export type CloseOutcome = { ok: true; traceId: string; reviewId: string } | { ok: false; status: 404 | 409 | 422; message: string };

/**
 * Closes a monitor: its readings become a stored trace (the CSV file above, imported like any upload) and a
 * normal review of it with the monitor's definitions, the same as uploading that file and reviewing it.
 */
export async function closeMonitor(id: string, actor: Actor): Promise<CloseOutcome> {
  return withMonitor(id, async () => {
    const m = await getMonitor(id);
    if (!m) return { ok: false, status: 404, message: `no monitor ${id}` };
    if (m.status !== "open") return { ok: false, status: 409, message: "the monitor is already closed" };
    const readings = await monitorReadings(id);
    if (readings.length < 2) return { ok: false, status: 422, message: "a monitor needs at least two readings to be closed into a trace and a review" };
    const bytes = new TextEncoder().encode(readingsCsv(readings));
    const fileName = `monitor-${id}.csv`;
    const stored = await importAndStoreTrace(bytes, { name: `${m.name} (monitor)`, fileName, options: readingsImportOptions(readings.some((r) => r.probe_C !== null)) }, actor);
    if (!stored.ok) return { ok: false, status: 422, message: stored.message };
    const review = await runAndStoreReview({ title: `${m.name} (closed monitor)`, traceId: stored.traceId, productId: m.productId, ...(m.packId ? { packId: m.packId } : {}), limitsId: m.limitsId, model: m.model as "auto" }, actor);
    if (!review.ok) return { ok: false, status: 422, message: review.message };
    await closeMonitorRow(id, stored.traceId, review.reviewId, actor);
    // open alerts end with the monitor
    for (const a of await openAlerts(id)) {
      const cleared = await clearAlert(a.id, new Date(), actor);
      if (cleared) deliverAlert({ ...m, status: "closed" } as StoredMonitor, cleared, "cleared");
    }
    dropLiveEntry(id);
    notifyMonitorChange(id);
    return { ok: true, traceId: stored.traceId, reviewId: review.reviewId };
  });
}

/** Whether this monitor is fed with the demo's public token (the page then shows the whole simulator command). */
export async function usesDemoToken(id: string, demoToken: string): Promise<boolean> {
  return (await monitorTokenHash(id)) === hashToken(demoToken);
}
