import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { createHmac } from "node:crypto";
import { createServer, type Server } from "node:http";
import { testDatabaseUrl } from "../helpers/database";
import { TEST_ACTOR, seedAccounts } from "../helpers/accounts";

// Alert deliveries survive a stopped process: a retry that was due while its process was gone is taken up by
// the next sweep (of any instance), exactly once, from the next attempt. The "stopped process" is written into
// the log the way the real one writes it (attempt 1 failed, attempt 2 due 4 minutes ago); the receiver is a
// real HTTP server on a local port (3600–3699 are the monitor suites'). Real database, real services.
const dir = mkdtempSync(path.join(tmpdir(), "corelag-resume-"));
const url = testDatabaseUrl(dir, "resume.db");
process.env.DATABASE_URL = url;
process.env.CORELAG_WEBHOOK_RETRY_BASE_S = "0.05";
process.env.CORELAG_WEBHOOK_MAX_ATTEMPTS = "4";
const PORT = 3614;
const HOOK = `http://127.0.0.1:${PORT}/hook`;
const DEMO = path.join(__dirname, "../../public/demo");
const received: Array<{ attempt: string; body: string; signature: string }> = [];
let receiver: Server;

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  // a monitor made by system:test gets a device token of the first administrator: there must be one
  seedAccounts(url);
  receiver = createServer((req, res) => {
    let body = "";
    req.on("data", (d) => (body += d));
    req.on("end", () => {
      received.push({ attempt: String(req.headers["x-corelag-attempt"]), body, signature: String(req.headers["x-corelag-signature"]) });
      res.statusCode = 200;
      res.end();
    });
  });
  await new Promise<void>((r) => receiver.listen(PORT, "127.0.0.1", () => r()));
});

afterAll(async () => {
  receiver?.close();
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

async function monitorWithAlert(name: string) {
  const dbm = await import("@/lib/db");
  const product = JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8"));
  const limits = JSON.parse(readFileSync(path.join(DEMO, "ready-meal.limits.json"), "utf8"));
  const productId = (await dbm.createDefinition("product", product, TEST_ACTOR)).id;
  const limitsId = (await dbm.createDefinition("limits", limits, TEST_ACTOR)).id;
  const { createMonitorService } = await import("@/lib/services/monitors");
  const m = await createMonitorService({ name, product_id: productId, limits_id: limitsId, alert: { lead_min: 60, webhooks: [HOOK] } }, TEST_ACTOR);
  if (!m.ok) throw new Error(m.message);
  const { raiseAlert } = await import("@/lib/db/monitors");
  const a = await raiseAlert(m.id, { key: "forecast:core-above-5C", kind: "forecast", rule: "core-above-5C", message: "limit within 40 min" }, new Date(Date.now() - 10 * 60_000), TEST_ACTOR);
  return { monitorId: m.id, alertId: a!.id };
}

describe("alert deliveries after a stopped process", () => {
  it("a retry left due by a stopped process is made by the next sweep, once, from the next attempt; one not yet overdue is left alone", async () => {
    const { logDelivery, alertHistory, getMonitor } = await import("@/lib/db/monitors");
    const { resumeDeliveries, deliveriesSettled, ORPHAN_GRACE_S } = await import("@/lib/services/alertDelivery");
    const now = Date.now();
    const { monitorId, alertId } = await monitorWithAlert("resumed");
    // the stopped process: attempt 1 answered 500 five minutes ago, attempt 2 was due four minutes ago
    await logDelivery({ alertId, event: "raised", channel: "webhook", target: HOOK, attempt: 1, at: new Date(now - 5 * 60_000), ok: false, httpStatus: 500, error: "HTTP 500", nextAt: new Date(now - 4 * 60_000) }, TEST_ACTOR);
    // another alert's retry, due only 10 s ago: its process may still be about to make it
    const other = await monitorWithAlert("still in hand");
    await logDelivery({ alertId: other.alertId, event: "raised", channel: "webhook", target: HOOK, attempt: 1, at: new Date(now - 20_000), ok: false, httpStatus: 500, error: "HTTP 500", nextAt: new Date(now - 10_000) }, TEST_ACTOR);
    expect(ORPHAN_GRACE_S).toBe(60);

    // two instances sweep at the same moment: exactly one takes the retry
    const counts = await Promise.all([resumeDeliveries(new Date(now)), resumeDeliveries(new Date(now))]);
    expect(counts[0] + counts[1]).toBe(1);
    await deliveriesSettled();
    expect(received.map((r) => r.attempt)).toEqual(["2"]);
    const secret = (await getMonitor(monitorId))!.webhookSecret;
    expect(received[0]!.signature).toBe(`sha256=${createHmac("sha256", secret).update(received[0]!.body).digest("hex")}`);
    expect(JSON.parse(received[0]!.body)).toMatchObject({ event: "alert.raised", alert: { id: alertId } });
    const d = (await alertHistory(monitorId))[0]!.deliveries;
    expect(d.map((x) => [x.attempt, x.ok, x.httpStatus])).toEqual([[1, false, 500], [2, true, 200]]);
    // the take-up is in the audit log, once, naming the attempt row and the attempt it made
    const { db } = await import("@/lib/db/client");
    const claims = await db.auditEntry.findMany({ where: { action: "resume", entity: "delivery", entityId: d[0]!.id } });
    expect(claims.map((c) => (c.details as { attempt: number }).attempt)).toEqual([2]);
    // nothing left to resume; the other alert's retry is untouched
    expect(await resumeDeliveries(new Date(now))).toBe(0);
    expect((await alertHistory(other.monitorId))[0]!.deliveries).toHaveLength(1);
    // a minute later it is overdue too, and taken up
    expect(await resumeDeliveries(new Date(now + 61_000))).toBe(1);
    await deliveriesSettled();
    expect((await alertHistory(other.monitorId))[0]!.deliveries.map((x) => x.attempt)).toEqual([1, 2]);
    // a retry due more than a day ago is not sent: stale news
    const old = await monitorWithAlert("a day old");
    await logDelivery({ alertId: old.alertId, event: "raised", channel: "webhook", target: HOOK, attempt: 1, at: new Date(now - 25 * 3600_000), ok: false, httpStatus: 500, error: "HTTP 500", nextAt: new Date(now - 25 * 3600_000 + 30_000) }, TEST_ACTOR);
    expect(await resumeDeliveries(new Date(now + 61_000))).toBe(0);
    const { verifyRecords } = await import("@/lib/services/verify");
    expect((await verifyRecords({ reproduce: false })).findings).toEqual([]);
  });
});
