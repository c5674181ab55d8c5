import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { createHmac } from "node:crypto";
import { createServer, type Server } from "node:http";
import { createServer as createTcpServer, type Server as TcpServer } from "node:net";
import { testDatabaseUrl } from "../helpers/database";
import { TEST_ACTOR, seedAccounts } from "../helpers/accounts";

// A real database (SQLite here, PostgreSQL under npm run test:pg), the real services, and a real HTTP receiver for the webhooks on a local port (3600–3699
// are this suite's). Retries are made fast through the configuration (30 s in production).
const dir = mkdtempSync(path.join(tmpdir(), "corelag-live-"));
const url = testDatabaseUrl(dir, "test.db");
process.env.DATABASE_URL = url;
process.env.CORELAG_WEBHOOK_RETRY_BASE_S = "0.05";
process.env.CORELAG_WEBHOOK_MAX_ATTEMPTS = "4";
const RECEIVER_PORT = 3611;
const SMTP_PORT = 3612;
process.env.CORELAG_SMTP_URL = `smtp://127.0.0.1:${SMTP_PORT}`;
process.env.CORELAG_MAIL_FROM = "alerts@corelag.test";
const DEMO = path.join(__dirname, "../../public/demo");

type Monitors = typeof import("@/lib/services/monitors");
let svc: Monitors;
let defs: { productId: string; limitsId: string };

interface Received {
  body: string;
  signature: string;
  event: string;
  attempt: string;
}
const received: Received[] = [];
/** The receiver answers 500 to the first two attempts of each event, then 200. */
const failuresLeft = new Map<string, number>();
let receiver: Server;

/** A minimal SMTP receiver (RFC 5321 commands, no TLS, no auth): keeps each message's envelope and data. */
const mails: Array<{ from: string; to: string[]; data: string }> = [];
let smtp: TcpServer;
function startSmtp(): Promise<void> {
  smtp = createTcpServer((sock) => {
    let buf = "", inData = false, cur = { from: "", to: [] as string[], data: "" };
    sock.write("220 test ESMTP\r\n");
    sock.on("data", (d) => {
      buf += d.toString("utf8");
      for (;;) {
        if (inData) {
          const end = buf.indexOf("\r\n.\r\n");
          if (end < 0) return;
          cur.data = buf.slice(0, end);
          buf = buf.slice(end + 5);
          inData = false;
          mails.push(cur);
          cur = { from: "", to: [], data: "" };
          sock.write("250 queued\r\n");
          continue;
        }
        const nl = buf.indexOf("\r\n");
        if (nl < 0) return;
        const line = buf.slice(0, nl);
        buf = buf.slice(nl + 2);
        const cmd = line.slice(0, 4).toUpperCase();
        if (cmd === "EHLO" || cmd === "HELO") sock.write("250 test\r\n");
        else if (cmd === "MAIL") (cur.from = line), sock.write("250 ok\r\n");
        else if (cmd === "RCPT") cur.to.push(line), sock.write("250 ok\r\n");
        else if (cmd === "DATA") (inData = true), sock.write("354 go on\r\n");
        else if (cmd === "QUIT") sock.end("221 bye\r\n");
        else sock.write("250 ok\r\n");
      }
    });
  });
  return new Promise((r) => smtp.listen(SMTP_PORT, "127.0.0.1", () => r()));
}

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  // a monitor made by system:test gets a device token of the first administrator: there must be one
  seedAccounts(url);
  svc = await import("@/lib/services/monitors");
  const dbm = await import("@/lib/db");
  const product = JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8"));
  const limits = JSON.parse(readFileSync(path.join(DEMO, "ready-meal.limits.json"), "utf8"));
  defs = { productId: (await dbm.createDefinition("product", product, TEST_ACTOR)).id, limitsId: (await dbm.createDefinition("limits", limits, TEST_ACTOR)).id };
  receiver = createServer((req, res) => {
    let body = "";
    req.on("data", (d) => (body += d));
    req.on("end", () => {
      const r = { body, signature: String(req.headers["x-corelag-signature"]), event: String(req.headers["x-corelag-event"]), attempt: String(req.headers["x-corelag-attempt"]) };
      received.push(r);
      const key = `${JSON.parse(body).alert.id}:${r.event}`;
      const left = failuresLeft.get(key) ?? 2;
      failuresLeft.set(key, left - 1);
      res.statusCode = left > 0 ? 500 : 200;
      res.end();
    });
  });
  await new Promise<void>((r) => receiver.listen(RECEIVER_PORT, "127.0.0.1", () => r()));
  await startSmtp();
});

afterAll(async () => {
  receiver?.close();
  smtp?.close();
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

const T0 = Date.parse("2026-06-09T06:00:00Z") / 1000;
const iso = (t_s: number) => new Date(t_s * 1000).toISOString();
const json = (readings: unknown[]) => new TextEncoder().encode(JSON.stringify({ readings }));

async function newMonitor(extra: Record<string, unknown> = {}) {
  const out = await svc.createMonitorService({ name: "Route 7 tote 3", product_id: defs.productId, limits_id: defs.limitsId, serial: "HX-0001", alert: { lead_min: 120, webhooks: [`http://127.0.0.1:${RECEIVER_PORT}/hook`] }, ...extra }, TEST_ACTOR);
  if (!out.ok) throw new Error(out.message);
  return out;
}

describe("monitors: readings, alerts and webhooks (local receiver)", () => {
  it("refuses bad readings by index and stores nothing, unless partial acceptance is asked", async () => {
    const m = await newMonitor({ alert: { lead_min: 60 } });
    const body = json([{ t: iso(T0), air_C: 3 }, { t: "2026-06-09 06:05", air_C: 3 }, { t: iso(T0 + 600), air_C: "warm" }, { t: iso(T0 + 900), air_C: 3.2 }, { t: "2099-01-01T00:00:00Z", air_C: 3 }, { t: "1970-01-01T00:00:00Z", air_C: 3 }]);
    const refused = await svc.postReadings(m.id, body, "application/json", false, TEST_ACTOR);
    expect(refused.ok).toBe(false);
    if (refused.ok) return;
    expect(refused.status).toBe(422);
    expect(refused.refused!.map((r) => r.index)).toEqual([1, 2, 4, 5]);
    expect(refused.refused![2]!.reason).toMatch(/ahead of the server's clock/);
    expect(refused.refused![3]!.reason).toMatch(/outside 1990–2100/);
    expect(refused.refused![0]!.reason).toMatch(/^t must be an ISO 8601 date-time/);
    expect(refused.refused![1]!.reason).toMatch(/^air_C must be a number/);
    const { monitorReadings } = await import("@/lib/db/monitors");
    expect(await monitorReadings(m.id)).toEqual([]);
    const partial = await svc.postReadings(m.id, body, "application/json", true, TEST_ACTOR);
    expect(partial.ok && partial.body.accepted).toBe(2);
    expect((await monitorReadings(m.id)).map((r) => r.t_s)).toEqual([T0, T0 + 900]);
  });

  it("ignores an equal repeat, reports a different one, takes CSV, and records each batch's SHA-256 in the audit log", async () => {
    const m = await newMonitor({ alert: { lead_min: 60 } });
    const first = await svc.postReadings(m.id, json([{ t: iso(T0), air_C: 3 }, { t: "2026-06-09T08:10:00+02:00", air_C: 3.1 }]), "application/json", false, TEST_ACTOR);
    expect(first.ok && first.body.accepted).toBe(2);
    const csv = new TextEncoder().encode(`t,air_C\n${iso(T0)},3\n${iso(T0 + 600)},3.5\n${iso(T0 + 1200)},3.4\n`);
    const again = await svc.postReadings(m.id, csv, "text/csv", false, TEST_ACTOR);
    expect(again.ok).toBe(true);
    if (!again.ok) return;
    expect(again.body).toMatchObject({ accepted: 1, duplicates: 1, conflicts: [{ index: 1, t: iso(T0 + 600) }] });
    const { createHash } = await import("node:crypto");
    const { listAudit } = await import("@/lib/db/audit");
    const entries = (await listAudit({ entityId: m.id })).filter((e) => e.action === "readings");
    // the audit page names the monitor, links to it and sums up each batch
    const { queryAudit } = await import("@/lib/db/auditQueries");
    const { auditSummary } = await import("@/lib/review/auditSummary");
    const page = await queryAudit({ object: m.id, action: "readings" });
    expect(page.rows[0]!.subject).toEqual({ name: "Route 7 tote 3", href: `/monitors/${m.id}` });
    expect(auditSummary("readings", page.rows[0]!.details)).toMatch(/^1 reading\(s\), 1 duplicate\(s\), 1 conflict\(s\), SHA-256 [0-9a-f]{12}…$/);
    expect(entries.map((e) => (e.details as { sha256: string }).sha256)).toEqual([createHash("sha256").update(json([{ t: iso(T0), air_C: 3 }, { t: "2026-06-09T08:10:00+02:00", air_C: 3.1 }])).digest("hex"), createHash("sha256").update(csv).digest("hex")]);
  });

  it("raises one forecast alert per condition, delivers it signed with retries on 500, and logs every attempt", async () => {
    const m = await newMonitor();
    // an hour at 3 °C, then the air at 14 °C: the lumped core (tau of the bare tray, ~3 h) is forecast to
    // reach 5 °C well inside the 120 min lead
    const rs = Array.from({ length: 13 }, (_, i) => ({ t: iso(T0 + i * 300), air_C: i < 12 ? 3 : 14 }));
    const out = await svc.postReadings(m.id, json(rs), "application/json", false, TEST_ACTOR);
    expect(out.ok).toBe(true);
    const view = (await svc.monitorView(m.id))!;
    const state = svc.stateJson(view);
    expect(state.forecast!.limit_rule).toBe("core-above-5C");
    expect(state.forecast!.minutes_to_limit).toBeGreaterThan(0);
    expect(state.forecast!.minutes_to_limit).toBeLessThan(120);
    expect(Object.keys(state).sort()).toEqual(["core_C", "forecast", "id", "last_reading", "rules", "stale"]);
    // the same condition on the next reading: no second alert
    await svc.postReadings(m.id, json([{ t: iso(T0 + 13 * 300), air_C: 14 }]), "application/json", false, TEST_ACTOR);
    const { deliveriesSettled } = await import("@/lib/services/alertDelivery");
    await deliveriesSettled();
    const { alertHistory } = await import("@/lib/db/monitors");
    const alerts = await alertHistory(m.id);
    expect(alerts.map((a) => a.key)).toEqual(["forecast:core-above-5C"]);
    // the alert names the reading it was judged at (T0 + 12 × 5 min), not only the server's clock
    expect(alerts[0]!.message).toMatch(/ \(as of the reading at 2026-06-09 07:00 UTC\)$/);
    const d = alerts[0]!.deliveries;
    expect(d.map((x) => [x.attempt, x.ok, x.httpStatus])).toEqual([[1, false, 500], [2, false, 500], [3, true, 200]]);
    // backoff: 0.05 s then 0.1 s (base·2^(n−1)); the log says when the next attempt was due
    expect(d[0]!.nextAt!.getTime() - d[0]!.at.getTime()).toBeGreaterThanOrEqual(49);
    expect(d[1]!.nextAt!.getTime() - d[1]!.at.getTime()).toBeGreaterThanOrEqual(99);
    const mine = received.filter((r) => JSON.parse(r.body).monitor.id === m.id);
    expect(mine.map((r) => r.attempt)).toEqual(["1", "2", "3"]);
    const secret = (await (await import("@/lib/db/monitors")).getMonitor(m.id))!.webhookSecret;
    for (const r of mine) expect(r.signature).toBe(`sha256=${createHmac("sha256", secret).update(r.body).digest("hex")}`);
    expect(JSON.parse(mine[0]!.body)).toMatchObject({ event: "alert.raised", monitor: { id: m.id, serial: "HX-0001" }, alert: { kind: "forecast", rule: "core-above-5C", cleared_at: null } });
    // the air back at 2 °C: the forecast no longer reaches the limit, the alert clears (and that is delivered too)
    await svc.postReadings(m.id, json([{ t: iso(T0 + 14 * 300), air_C: 2 }]), "application/json", false, TEST_ACTOR);
    await deliveriesSettled();
    const after = await alertHistory(m.id);
    expect(after[0]!.clearedAt).not.toBeNull();
    expect(after[0]!.deliveries.filter((x) => x.event === "cleared").map((x) => x.ok)).toEqual([false, false, true]);
    const { listAudit } = await import("@/lib/db/audit");
    const actions = (await listAudit({ entityId: after[0]!.id })).map((e) => e.action);
    expect(actions.filter((a) => a === "raise")).toHaveLength(1);
    expect(actions.filter((a) => a === "clear")).toHaveLength(1);
    expect(actions.filter((a) => a === "deliver")).toHaveLength(6);
  });

  it("e-mails an alert through the configured SMTP server (nodemailer), with the caution, and logs the attempt", async () => {
    const m = await newMonitor({ name: "Route 9 tote 1", alert: { lead_min: 120, emails: ["qa@example.org"] } });
    const rs = Array.from({ length: 13 }, (_, i) => ({ t: iso(T0 + i * 300), air_C: i < 12 ? 3 : 14 }));
    expect((await svc.postReadings(m.id, json(rs), "application/json", false, TEST_ACTOR)).ok).toBe(true);
    const { deliveriesSettled } = await import("@/lib/services/alertDelivery");
    await deliveriesSettled();
    const mail = mails.find((x) => x.data.includes("Route 9 tote 1"))!;
    expect(mail.from).toContain("alerts@corelag.test");
    expect(mail.to).toEqual(["RCPT TO:<qa@example.org>"]);
    expect(mail.data).toMatch(/Subject: Alert: Route 9 tote 1: limit forecast/);
    expect(mail.data.replace(/=\r\n/g, "")).toContain("local regulations");
    const { alertHistory } = await import("@/lib/db/monitors");
    const email = (await alertHistory(m.id))[0]!.deliveries.filter((d) => d.channel === "email");
    expect(email.map((d) => [d.target, d.attempt, d.ok])).toEqual([["qa@example.org", 1, true]]);
  });

  it("raises a stale alert on the injected clock, and clears it when readings come back", async () => {
    const m = await newMonitor({ alert: { lead_min: 0 } });
    const { liveEntry } = await import("@/lib/services/liveRegistry");
    // readings 60 s apart (invented fixture): their interval is a floor under the delivery interval (lib/live/stale.ts)
    for (let i = 0; i < 3; i++) await svc.postReadings(m.id, json([{ t: iso(T0 + i * 60), air_C: 3 }]), "application/json", false, TEST_ACTOR);
    const entry = await liveEntry(m.id);
    // arrivals are the batches' receipt times; pretend they came 60 s apart, the last one now
    const now = Date.now() / 1000;
    entry.arrivals_s.splice(0, entry.arrivals_s.length, now - 120, now - 60, now);
    expect((await svc.evaluateAlerts(entry, new Date((now + 179) * 1000))).raised).toEqual([]);
    expect((await svc.evaluateAlerts(entry, new Date((now + 181) * 1000))).raised).toEqual(["stale"]);
    expect((await svc.evaluateAlerts(entry, new Date((now + 400) * 1000))).raised).toEqual([]);
    entry.arrivals_s.push(now + 401);
    expect((await svc.evaluateAlerts(entry, new Date((now + 402) * 1000))).cleared).toEqual(["stale"]);
  });

  it("closing turns the readings into a stored trace and a review, the same bits as uploading them as a file and reviewing it", async () => {
    const m = await newMonitor({ alert: { lead_min: 30 } });
    const csv = readFileSync(path.join(DEMO, "route7-tote3.csv"), "utf8").split("\n").slice(5).filter((l) => l.trim());
    const rs = csv.slice(0, 120).map((l) => {
      const [ts, air] = l.split(",");
      return { t: new Date(ts!).toISOString(), air_C: Number(air) };
    });
    for (let i = 0; i < rs.length; i += 20) expect((await svc.postReadings(m.id, json(rs.slice(i, i + 20)), "application/json", false, TEST_ACTOR)).ok).toBe(true);
    const live = (await svc.monitorView(m.id))!.entry.live;
    const closed = await svc.closeMonitor(m.id, TEST_ACTOR);
    expect(closed.ok).toBe(true);
    if (!closed.ok) return;
    const { getReview } = await import("@/lib/db/reviews");
    const fromMonitor = (await getReview(closed.reviewId))!;
    // the same readings written as a file by hand, uploaded and reviewed like any file
    const { importAndStoreTrace } = await import("@/lib/services/traces");
    const { runAndStoreReview } = await import("@/lib/services/reviews");
    const file = "t,air_C\n" + rs.map((r) => `${r.t},${r.air_C}`).join("\n") + "\n";
    const up = await importAndStoreTrace(new TextEncoder().encode(file), { fileName: "by-hand.csv", options: svc.readingsImportOptions(false) }, TEST_ACTOR);
    expect(up.ok).toBe(true);
    if (!up.ok) return;
    const rv = await runAndStoreReview({ title: "by hand", traceId: up.traceId, productId: defs.productId, limitsId: defs.limitsId }, TEST_ACTOR);
    expect(rv.ok).toBe(true);
    if (!rv.ok) return;
    const byHand = (await getReview(rv.reviewId))!;
    expect(fromMonitor.resultSha256).toBe(byHand.resultSha256);
    expect(Buffer.from(fromMonitor.core_C.buffer).equals(Buffer.from(byHand.core_C.buffer))).toBe(true);
    // and the live state, stepped reading by reading, equals the stored review's core (exact lumped update)
    for (let k = 0; k < live.length; k++) expect(Math.abs(live.core_C[k]! - fromMonitor.core_C[k]!)).toBeLessThanOrEqual(1e-9);
    const again = await svc.postReadings(m.id, json([{ t: iso(T0), air_C: 3 }]), "application/json", false, TEST_ACTOR);
    expect(again.ok ? 0 : again.status).toBe(409);
  });
});
