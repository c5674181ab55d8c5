import { createHmac } from "node:crypto";
import { config } from "../config";
import { claimDeliveryRetry, deliveryRetryTaken, getAlert, getMonitor, logDelivery, overdueDeliveryRetries, type StoredAlert, type StoredMonitor } from "../db/monitors";
import type { Actor } from "../access/actor";

/** The header that carries the body's signature: "sha256=" and the hex HMAC-SHA256 of the exact body bytes with the monitor's secret. */
export const SIGNATURE_HEADER = "X-Corelag-Signature";

export function signBody(secret: string, body: string): string {
  return `sha256=${createHmac("sha256", secret).update(body, "utf8").digest("hex")}`;
}

export type AlertEvent = "raised" | "cleared";

/** The JSON a webhook receives (and the facts an e-mail states). */
export function alertPayload(m: StoredMonitor, a: StoredAlert, event: AlertEvent, sentAt: Date) {
  return {
    event: `alert.${event}`,
    sent_at: sentAt.toISOString(),
    monitor: { id: m.id, name: m.name, shipment_id: m.shipmentId, serial: m.serial },
    alert: { id: a.id, kind: a.kind, condition: a.key, rule: a.rule, message: a.message, raised_at: a.raisedAt.toISOString(), cleared_at: a.clearedAt ? a.clearedAt.toISOString() : null },
  };
}

/** Delay before attempt n+1 after attempt n failed: base·2^(n−1) (exponential backoff). */
export function retryDelay_s(attempt: number, base_s = config().CORELAG_WEBHOOK_RETRY_BASE_S): number {
  return base_s * 2 ** (attempt - 1);
}

const g = globalThis as unknown as { __corelagDeliveries?: Set<Promise<void>> };
const pending = (g.__corelagDeliveries ??= new Set());

/** Resolves when every delivery started in this process has finished (its last attempt logged). For tests and shutdown. */
export async function deliveriesSettled(): Promise<void> {
  while (pending.size) await Promise.all([...pending]);
}

function track(p: Promise<void>): void {
  pending.add(p);
  p.finally(() => pending.delete(p)).catch(() => undefined);
}

const sleep = (s: number) => new Promise<void>((r) => setTimeout(r, s * 1000).unref?.());

/**
 * Sleeps until the retry that attempt row `deliveryId` scheduled; false when a sweep took it up meanwhile
 * (it presumed this process stopped: only after ORPHAN_GRACE_S past due), and this one must stop.
 */
async function awaitRetry(deliveryId: string, delay_s: number): Promise<boolean> {
  await sleep(delay_s);
  return !(await deliveryRetryTaken(deliveryId));
}

/**
 * One webhook: POST the signed JSON, retried with backoff on an error or a non-2xx answer; every attempt
 * logged. `first` > 1 resumes a delivery whose process stopped (resumeDeliveries).
 */
async function deliverWebhook(m: StoredMonitor, a: StoredAlert, event: AlertEvent, url: string, actor: Actor, first = 1): Promise<void> {
  const max = config().CORELAG_WEBHOOK_MAX_ATTEMPTS;
  // one body for every attempt of this process: the receiver can tell a retry by the alert id and event
  const body = JSON.stringify(alertPayload(m, a, event, new Date()));
  for (let attempt = first; attempt <= max; attempt++) {
    let status: number | undefined, error: string | undefined;
    try {
      const res = await fetch(url, {
        method: "POST",
        headers: { "Content-Type": "application/json", [SIGNATURE_HEADER]: signBody(m.webhookSecret, body), "X-Corelag-Event": `alert.${event}`, "X-Corelag-Attempt": String(attempt) },
        body,
        signal: AbortSignal.timeout(10_000),
        redirect: "manual",
      });
      status = res.status;
      await res.body?.cancel().catch(() => undefined);
      if (!(res.status >= 200 && res.status < 300)) error = `HTTP ${res.status}`;
    } catch (e) {
      error = e instanceof Error ? (e.cause instanceof Error ? `${e.message}: ${e.cause.message}` : e.message) : String(e);
    }
    const ok = error === undefined;
    const again = !ok && attempt < max;
    const delay = retryDelay_s(attempt);
    const row = await logDelivery({ alertId: a.id, event, channel: "webhook", target: url, attempt, at: new Date(), ok, httpStatus: status, error, nextAt: again ? new Date(Date.now() + delay * 1000) : undefined }, actor);
    if (!again || !(await awaitRetry(row, delay))) return;
  }
}

/** One e-mail through the configured SMTP server (nodemailer), retried like a webhook. */
async function deliverEmail(m: StoredMonitor, a: StoredAlert, event: AlertEvent, to: string, smtpUrl: string, actor: Actor, first = 1): Promise<void> {
  const { createTransport } = await import("nodemailer");
  const transport = createTransport(smtpUrl);
  const p = alertPayload(m, a, event, new Date());
  const subject = `${event === "raised" ? "Alert" : "Cleared"}: ${m.name}: ${a.kind === "forecast" ? "limit forecast" : a.kind === "stale" ? "no readings" : "rule fails"}`;
  const text = [
    `${p.alert.message}`,
    "",
    `Monitor: ${m.name}${m.shipmentId ? ` (shipment ${m.shipmentId})` : ""}${m.serial ? `, logger ${m.serial}` : ""}`,
    `Raised: ${p.alert.raised_at}${p.alert.cleared_at ? `; cleared ${p.alert.cleared_at}` : ""}`,
    "",
    "The forecast is an estimate from a model and the readings so far. Decide on the shipment under your local regulations and licensed food-safety practice.",
  ].join("\n");
  const max = config().CORELAG_WEBHOOK_MAX_ATTEMPTS;
  for (let attempt = first; attempt <= max; attempt++) {
    let error: string | undefined;
    try {
      await transport.sendMail({ from: config().CORELAG_MAIL_FROM, to, subject, text });
    } catch (e) {
      error = e instanceof Error ? e.message : String(e);
    }
    const again = error !== undefined && attempt < max;
    const delay = retryDelay_s(attempt);
    const row = await logDelivery({ alertId: a.id, event, channel: "email", target: to, attempt, at: new Date(), ok: error === undefined, error, nextAt: again ? new Date(Date.now() + delay * 1000) : undefined }, actor);
    if (!again || !(await awaitRetry(row, delay))) return;
  }
}

/**
 * Sends an alert event to every webhook and (when SMTP is configured) every address of the monitor, in the
 * background: the request that raised the alert does not wait. Retries happen in this process; one still due
 * when the process stops is taken up by the next sweep of any instance (resumeDeliveries).
 */
export function deliverAlert(m: StoredMonitor, a: StoredAlert, event: AlertEvent, actor: Actor = { kind: "system", what: "alerts" }): void {
  for (const url of m.webhooks) track(deliverWebhook(m, a, event, url, actor).catch((e) => console.error(`webhook delivery to ${url} failed to log:`, e)));
  const smtp = config().CORELAG_SMTP_URL;
  if (smtp) for (const to of m.emails) track(deliverEmail(m, a, event, to, smtp, actor).catch((e) => console.error(`e-mail to ${to} failed to log:`, e)));
}

/** How long past its due time a retry waits before a sweep presumes its process dead and takes it (an attempt takes at most 10 s). */
export const ORPHAN_GRACE_S = 60;
/** Retries due longer ago than this are not resumed: a day-old alert sent now would mislead more than inform. */
export const RESUME_WINDOW_S = 24 * 3600;

/**
 * Resumes the retries whose process stopped while waiting for them (due more than ORPHAN_GRACE_S and less than
 * RESUME_WINDOW_S ago, not made and not taken): each is taken (an audited claim, so no other instance resumes it
 * too) and continued from the next attempt, in the background. Returns how many were resumed.
 */
export async function resumeDeliveries(now = new Date(), actor: Actor = { kind: "system", what: "alerts" }): Promise<number> {
  let resumed = 0;
  const since = new Date(now.getTime() - RESUME_WINDOW_S * 1000);
  for (const d of await overdueDeliveryRetries(since, new Date(now.getTime() - ORPHAN_GRACE_S * 1000))) {
    const a = await getAlert(d.alertId);
    const m = a && (await getMonitor(a.monitorId));
    if (!a || !m || !(await claimDeliveryRetry(d, actor))) continue;
    const event = d.event === "cleared" ? "cleared" : "raised";
    if (d.channel === "webhook") {
      track(deliverWebhook(m, a, event, d.target, actor, d.attempt + 1).catch((e) => console.error(`webhook delivery to ${d.target} failed to log:`, e)));
    } else {
      const smtp = config().CORELAG_SMTP_URL;
      if (!smtp) {
        console.error(`corelag: an e-mail retry to ${d.target} is due but SMTP is no longer configured; it is dropped`);
        continue;
      }
      track(deliverEmail(m, a, event, d.target, smtp, actor, d.attempt + 1).catch((e) => console.error(`e-mail to ${d.target} failed to log:`, e)));
    }
    resumed++;
  }
  return resumed;
}
