import { createHmac } from "node:crypto";
import { config } from "../config";
import { logDelivery, type StoredAlert, type StoredMonitor } from "../db/monitors";
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

/** One webhook: POST the signed JSON, retried with backoff on an error or a non-2xx answer; every attempt logged. */
async function deliverWebhook(m: StoredMonitor, a: StoredAlert, event: AlertEvent, url: string, actor: Actor): Promise<void> {
  const max = config().CORELAG_WEBHOOK_MAX_ATTEMPTS;
  // one body for every attempt: the receiver can tell a retry by the delivery's alert id, event and sent_at
  const body = JSON.stringify(alertPayload(m, a, event, new Date()));
  for (let attempt = 1; attempt <= max; attempt++) {
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
    await logDelivery({ alertId: a.id, event, channel: "webhook", target: url, attempt, at: new Date(), ok, httpStatus: status, error, nextAt: again ? new Date(Date.now() + delay * 1000) : undefined }, actor);
    if (!again) return;
    await sleep(delay);
  }
}

/** One e-mail through the configured SMTP server (nodemailer), retried like a webhook. */
async function deliverEmail(m: StoredMonitor, a: StoredAlert, event: AlertEvent, to: string, smtpUrl: string, actor: Actor): Promise<void> {
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
  for (let attempt = 1; attempt <= max; attempt++) {
    let error: string | undefined;
    try {
      await transport.sendMail({ from: config().CORELAG_MAIL_FROM, to, subject, text });
    } catch (e) {
      error = e instanceof Error ? e.message : String(e);
    }
    const again = error !== undefined && attempt < max;
    const delay = retryDelay_s(attempt);
    await logDelivery({ alertId: a.id, event, channel: "email", target: to, attempt, at: new Date(), ok: error === undefined, error, nextAt: again ? new Date(Date.now() + delay * 1000) : undefined }, actor);
    if (!again) return;
    await sleep(delay);
  }
}

/**
 * Sends an alert event to every webhook and (when SMTP is configured) every address of the monitor, in the
 * background: the request that raised the alert does not wait. Retries happen in this process; an attempt
 * still due when the server stops is not resumed (its `nextAt` stays in the log).
 */
export function deliverAlert(m: StoredMonitor, a: StoredAlert, event: AlertEvent, actor: Actor = { kind: "system", what: "alerts" }): void {
  for (const url of m.webhooks) track(deliverWebhook(m, a, event, url, actor).catch((e) => console.error(`webhook delivery to ${url} failed to log:`, e)));
  const smtp = config().CORELAG_SMTP_URL;
  if (smtp) for (const to of m.emails) track(deliverEmail(m, a, event, to, smtp, actor).catch((e) => console.error(`e-mail to ${to} failed to log:`, e)));
}
