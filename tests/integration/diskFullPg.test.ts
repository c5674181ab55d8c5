import { spawnSync } from "node:child_process";
import { chmodSync, chownSync, mkdirSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir, userInfo } from "node:os";
import path from "node:path";
import { randomBytes } from "node:crypto";
import pg from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startServer, type RunningServer } from "../helpers/server";
import { testDatabaseKind, testPgServer } from "../helpers/database";
import { seedAccounts, signedInFetch } from "../helpers/accounts";

const fetch = signedInFetch("reviewer");

// A full disk on PostgreSQL (issue 14): the table of stored traces (with its TOAST data, where the file bytes
// go) lives in a tablespace on a 24 MB tmpfs, uploads go on until it is full, and then the upload is refused
// with a clear 507, nothing partial is stored, the chain still verifies and the app keeps answering. Only that
// table moves: with the whole database on the tmpfs, a connection opened after the disk filled could fail
// while writing PostgreSQL's own catalog cache file ("could not write init file"), which tests the server's
// start-up, not Corelag. Needs root (mount) and the test server on this machine; skipped otherwise, saying
// why. (SQLite's full disk: tests/integration/diskFull.test.ts.)
const reason =
  testDatabaseKind() !== "postgres" ? "runs on PostgreSQL only (npm run test:pg)"
  : userInfo().uid !== 0 ? "needs root to mount a small tmpfs"
  : !testPgServer() || !/127\.0\.0\.1|localhost/.test(testPgServer()!) ? "needs the PostgreSQL test server on this machine"
  : null;
if (reason) console.log(`diskFullPg: skipped: ${reason}`);

const dir = mkdtempSync(path.join(tmpdir(), "corelag-pgfull-"));
const mountPoint = path.join(dir, "small");
const name = `corelag_full_${randomBytes(4).toString("hex")}`;
let url = "";
let mounted = false;
let server: RunningServer | undefined;
const admin = () => new pg.Client({ connectionString: testPgServer()! });

beforeAll(async () => {
  if (reason) return;
  chmodSync(dir, 0o755); // the server (user postgres) must reach the mount point
  mkdirSync(mountPoint);
  const m = spawnSync("mount", ["-t", "tmpfs", "-o", "size=24m", "tmpfs", mountPoint], { encoding: "utf8" });
  if (m.status !== 0) throw new Error(`mount failed: ${m.stderr}`);
  mounted = true;
  const pgUid = Number(spawnSync("id", ["-u", "postgres"], { encoding: "utf8" }).stdout.trim());
  chownSync(mountPoint, pgUid, 0);
  const c = admin();
  await c.connect();
  await c.query(`CREATE TABLESPACE ${name} LOCATION '${mountPoint}'`);
  await c.query(`CREATE DATABASE ${name}`);
  await c.end();
  const u = new URL(testPgServer()!);
  u.pathname = `/${name}`;
  url = u.toString();
  process.env.DATABASE_URL = url;
  process.env.CORELAG_SIGNING_KEY_FILE = path.join(dir, "key.pem");
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  const t = new pg.Client({ connectionString: url });
  await t.connect();
  await t.query(`ALTER TABLE "Trace" SET TABLESPACE ${name}`);
  await t.end();
  seedAccounts(url);
  server = await startServer({ DATABASE_URL: url });
}, 180_000);

afterAll(async () => {
  await server?.stop();
  if (!reason) {
    const { db } = await import("@/lib/db/client");
    await db.$disconnect();
    const c = admin();
    await c.connect();
    await c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`).catch(() => undefined);
    await c.query(`DROP TABLESPACE IF EXISTS ${name}`).catch(() => undefined);
    await c.end();
  }
  if (mounted) spawnSync("umount", [mountPoint]);
  rmSync(dir, { recursive: true, force: true });
});

// 100,000 one-minute readings with noisy values (about 3 MB; PostgreSQL compresses stored bytes, so the
// readings are pseudo-random to keep the stored size near the upload's): invented
const csv = (() => {
  const start = Date.UTC(2026, 0, 1);
  const lines = ["time,air_C"];
  let x = 12345;
  for (let i = 0; i < 100_000; i++) {
    x = (x * 1103515245 + 12345) % 2147483648; // a linear congruential generator (glibc's constants)
    lines.push(`${new Date(start + i * 60_000).toISOString()},${(2 + (8 * x) / 2147483648).toFixed(5)}`);
  }
  return new TextEncoder().encode(lines.join("\n") + "\n");
})();

describe.skipIf(reason !== null)("a full disk on PostgreSQL", () => {
  it("refuses the upload that no longer fits with a 507 naming the cause, stores nothing partial, and keeps working", async () => {
    const statuses: number[] = [];
    let message = "";
    for (let i = 0; i < 30; i++) {
      const form = new FormData();
      form.set("file", new File([csv], `full-${i}.csv`, { type: "text/csv" }));
      form.set("name", `filling ${i}`);
      form.set("options", "{}");
      const r = await fetch(`${server!.url}/api/traces`, { method: "POST", body: form });
      statuses.push(r.status);
      if (r.status !== 201) {
        const text = await r.text();
        message = text.startsWith("{") ? (JSON.parse(text) as { error: string }).error : `HTTP ${r.status}: ${text.slice(0, 200)} ${server!.output().slice(-1500)}`;
        break;
      }
    }
    expect(statuses.at(-1)).toBe(507);
    expect(statuses.slice(0, -1).every((s) => s === 201)).toBe(true);
    expect(message).toMatch(/the server's disk is full, so the trace could not be stored\. Nothing was stored/);
    const { db } = await import("@/lib/db/client");
    const stored = statuses.filter((s) => s === 201).length;
    expect(await db.trace.count()).toBe(stored);
    expect(await db.auditEntry.count({ where: { action: "import" } })).toBe(stored);
    const { verifyRecords } = await import("@/lib/services/verify");
    expect((await verifyRecords({ reproduce: false })).findings).toEqual([]);
    expect((await fetch(`${server!.url}/traces`)).status).toBe(200);
  }, 300_000);
});
