import { randomBytes } from "node:crypto";
import { alertChanges, alertConditions, createMonitorSchema, forecast, parseReadingsCsv, parseReadingsJson, staleness, type Forecast, type RuleRunning } from "../live";
import type { z } from "zod";
import { generateToken, hashToken, tokenPrefix } from "../api/token";
import type { monitorStateSchema } from "../api/schemas";
import { sha256Hex } from "../trace";
import { clearAlert, closeMonitorRow, createMonitor, getMonitor, monitorReadings, monitorHasDeviceToken, openAlerts, openMonitorIds, raiseAlert, storeBatch, batchReceivedAt, type StoredMonitor } from "../db/monitors";
import { deliverAlert, resumeDeliveries } from "./alertDelivery";
import { dropLiveEntry, liveEntry, loadMonitorDefinitions, notifyMonitorChange, withMonitor, type LiveEntry } from "./liveRegistry";
import { importAndStoreTrace } from "./traces";
import { runAndStoreReview } from "./reviews";
import { firstAdministrator } from "../db/apiTokens";
import type { Actor } from "../access/actor";

export { createMonitorSchema, type CreateMonitorInput } from "../live";

export type CreateMonitorOutcome = { ok: true; id: string; device_token: string } | { ok: false; field: string; message: string };

/** Readings may carry times up to this far ahead of the server's clock (clocks drift; zones get mixed up), s. */
export const FUTURE_TOLERANCE_S = 24 * 3600;

/** A token's name is at most 120 characters (lib/services/apiTokens.ts); the monitor's name may be 160. */
const deviceTokenName = (monitorName: string) => `device: ${monitorName}`.slice(0, 120);

/**
 * Whose device token it is: the person creating the monitor, or for a token the token's owner. The demo loader
 * and the command line are nobody's: their monitors' tokens belong to the first administrator (the oldest enabled
 * admin account), who can see and revoke them on /tokens like their own.
 */
async function deviceTokenOwner(actor: Actor): Promise<string | null> {
  if (actor.kind === "user" || actor.kind === "token") return actor.userId;
  return (await firstAdministrator())?.id ?? null;
}

/**
 * Creates a monitor and its device token: an API token with the `device` scope, bound to this monitor, that
 * may only post its readings. The token is returned once; only its SHA-256 is kept (monitor and token are one
 * transaction, each with its audit entry).
 */
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
  const owner = await deviceTokenOwner(actor);
  if (!owner) return { ok: false, field: "body", message: "a monitor's device token needs an owner, and there is no administrator yet: create one first (corelag user add --role admin)" };
  // a fixed token only for the demo monitor (lib/services/demoNames.ts), whose token is public
  const device_token = fixedToken ?? generateToken().token;
  const sha256 = hashToken(device_token);
  const m = await createMonitor(
    {
      name: b.name, productId: b.product_id, packId: b.pack_id, limitsId: b.limits_id, shipmentId: b.shipment_id, serial: b.serial, model: b.model,
      alertLeadMin: b.alert.lead_min, airHold: b.forecast_air?.hold ?? "current", airHoldCount: b.forecast_air?.hold === "mean" ? (b.forecast_air.last ?? 6) : undefined,
      webhooks: b.alert.webhooks, emails: b.alert.emails, webhookSecret: randomBytes(32).toString("hex"), deviceTokenSha256: sha256,
    },
    { userId: owner, name: deviceTokenName(b.name), prefix: tokenPrefix(device_token), tokenSha256: sha256 },
    actor,
  );
  return { ok: true, id: m.monitor.id, device_token };
}

/**
 * The binding check of the readings route, after the access wrapper let the actor post readings at all: a
 * device token posts only to the monitor it is bound to (403 otherwise); people and write tokens whose role
 * allows `monitor:post-readings` may post to any monitor.
 */
export function deviceBindingRefusal(actor: Actor, monitorId: string): string | null {
  if (actor.kind !== "token" || actor.scope !== "device") return null;
  if (actor.monitorId === monitorId) return null;
  return actor.monitorId
    ? `this device token ('${actor.tokenName}') is bound to another monitor (${actor.monitorId}); it posts readings to that monitor only`
    : `this device token ('${actor.tokenName}') is bound to no monitor, so it may post readings nowhere; make one with the monitor (or corelag token create --scope device --monitor ID)`;
}

/** The state as GET /api/v1/monitors/{id} gives it (the issue's fields, exactly: lib/api/schemas.ts). */
export type MonitorStateJson = z.output<typeof monitorStateSchema>;

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
  const openKeys = open.map((a) => a.key);
  const n = entry.live.length;
  const conds = entry.monitor.status === "open" ? alertConditions(v.rules, v.forecast, v.stale, entry.monitor.alertLeadMin, openKeys, n ? entry.live.t_s[n - 1] : undefined) : [];
  const { raise, clear } = alertChanges(conds, openKeys);
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

/** Whether this monitor is fed with the demo's public token, not revoked (the page then shows the whole simulator command). */
export async function usesDemoToken(id: string, demoToken: string): Promise<boolean> {
  return monitorHasDeviceToken(id, hashToken(demoToken));
}
