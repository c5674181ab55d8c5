import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { createHash } from "node:crypto";
import { createRequire } from "node:module";
import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { newPgDatabaseUrl, testDatabaseKind, testPgServer } from "../helpers/database";

// A database made before device tokens were API tokens (every migration before 20261203090000_device_tokens),
// holding a monitor with the old kind of token (`cmd_` + 32 characters, only its SHA-256 stored on the
// monitor), then upgraded by that migration: the old token must keep posting to its monitor, as a device
// API token of the first administrator. SQLite here, PostgreSQL (its generated migrations) under npm run test:pg.
const ROOT = path.resolve(__dirname, "..", "..");
const NEW = "20261203090000_device_tokens";
const kind = testDatabaseKind();
const dir = mkdtempSync(path.join(tmpdir(), "corelag-devtok-"));
/** an old-style device token (invented: 32 base64url characters after cmd_, as createMonitorService made them) */
const OLD_TOKEN = "cmd_" + "q7Vb2kLw9XeR4tYp0ZcNf8MhJd3sGa6U";
const sha = (t: string) => createHash("sha256").update(t, "utf8").digest("hex");

type Exec = { exec(sql: string): Promise<void>; all<T>(sql: string): Promise<T[]>; close(): Promise<void> };

async function openDatabase(label: string): Promise<{ url: string; db: Exec }> {
  if (kind === "sqlite") {
    const Database = createRequire(__filename)("better-sqlite3") as new (file: string) => { exec(sql: string): void; prepare(sql: string): { all(): unknown[] }; close(): void };
    const file = path.join(dir, `${label}.db`);
    const conn = new Database(file);
    return { url: `file:${file}`, db: { exec: async (s) => void conn.exec(s), all: async <T,>(s: string) => conn.prepare(s).all() as T[], close: async () => conn.close() } };
  }
  const { Client } = createRequire(__filename)("pg") as typeof import("pg");
  const url = newPgDatabaseUrl(label);
  const admin = new Client({ connectionString: testPgServer()! });
  await admin.connect();
  await admin.query(`CREATE DATABASE "${new URL(url).pathname.slice(1)}"`);
  await admin.end();
  const conn = new Client({ connectionString: url });
  await conn.connect();
  return { url, db: { exec: async (s) => void (await conn.query(s)), all: async <T,>(s: string) => (await conn.query(s)).rows as T[], close: () => conn.end() } };
}

/** The migration files of this database kind, in order, split at the new one. */
function migrations(): { before: string[]; upgrade: string } {
  const folder = kind === "sqlite" ? path.join(ROOT, "prisma", "migrations") : path.join(ROOT, "prisma", "postgres", "migrations");
  const names = readdirSync(folder, { withFileTypes: true }).filter((d) => d.isDirectory()).map((d) => d.name).sort();
  const read = (n: string) => readFileSync(path.join(folder, n, "migration.sql"), "utf8");
  return { before: names.filter((n) => n < NEW).map(read), upgrade: read(NEW) };
}

const at = (iso: string) => (kind === "sqlite" ? String(Date.parse(iso)) : `'${iso}'`);
const bool = (b: boolean) => (kind === "sqlite" ? (b ? "1" : "0") : b ? "true" : "false");
const user = (id: string, role: string, disabled: boolean, created: string) =>
  `INSERT INTO "User" ("id", "name", "email", "role", "disabled", "createdAt", "updatedAt") VALUES ('${id}', '${id} (invented)', '${id}@example.test', '${role}', ${bool(disabled)}, ${at(created)}, ${at(created)})`;
const monitor = (id: string, token: string) =>
  `INSERT INTO "Monitor" ("id", "name", "productId", "limitsId", "alertLeadMin", "webhooks", "emails", "webhookSecret", "deviceTokenSha256", "createdAt") VALUES ('${id}', 'Route 7 tote 3 (old)', 'p1', 'l1', 60, '[]', '[]', 'secret', '${sha(token)}', ${at("2026-06-01T00:00:00Z")})`;

let upgraded: { url: string; db: Exec };

beforeAll(async () => {
  const m = migrations();
  upgraded = await openDatabase("upgraded");
  for (const sql of m.before) await upgraded.db.exec(sql);
  // the oldest admin is disabled, so the owner is the next one; a reviewer is no administrator
  await upgraded.db.exec(user("admin-old-disabled", "admin", true, "2026-01-01T00:00:00Z"));
  await upgraded.db.exec(user("admin-first", "admin", false, "2026-02-01T00:00:00Z"));
  await upgraded.db.exec(user("admin-later", "admin", false, "2026-03-01T00:00:00Z"));
  await upgraded.db.exec(user("reviewer", "reviewer", false, "2025-12-01T00:00:00Z"));
  await upgraded.db.exec(monitor("mon-old", OLD_TOKEN));
  await upgraded.db.exec(m.upgrade);
  process.env.DATABASE_URL = upgraded.url;
}, 120_000);

afterAll(async () => {
  await upgraded?.db.close();
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

describe(`migration ${NEW}: a monitor's old device token becomes a device API token`, () => {
  it("the old token's hash is an ApiToken row: scope device, bound to the monitor, owned by the first enabled administrator", async () => {
    const rows = await upgraded.db.all<{ name: string; userId: string; scope: string; prefix: string; tokenSha256: string; monitorId: string; revokedAt: unknown }>(`SELECT "name", "userId", "scope", "prefix", "tokenSha256", "monitorId", "revokedAt" FROM "ApiToken"`);
    expect(rows).toEqual([{ name: "device: Route 7 tote 3 (old)", userId: "admin-first", scope: "device", prefix: "cmd_", tokenSha256: sha(OLD_TOKEN), monitorId: "mon-old", revokedAt: null }]);
  });

  it("the old token authenticates as that device token, and may post to its own monitor only", async () => {
    const { actorFromAuthorization } = await import("@/lib/services/apiTokens");
    const { deviceBindingRefusal } = await import("@/lib/services/monitors");
    const r = await actorFromAuthorization(`Bearer ${OLD_TOKEN}`);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.actor).toMatchObject({ kind: "token", scope: "device", tokenName: "device: Route 7 tote 3 (old)", userId: "admin-first", role: "admin", monitorId: "mon-old" });
    expect(deviceBindingRefusal(r.actor, "mon-old")).toBeNull();
    expect(deviceBindingRefusal(r.actor, "mon-other")).toMatch(/bound to another monitor \(mon-old\)/);
    // and it is listed and can be revoked like any token; then it is refused
    const { listTokens, revokeToken } = await import("@/lib/services/apiTokens");
    const listed = await listTokens({ includeRevoked: true });
    const item = listed.ok ? listed.tokens.find((t) => t.monitor_id === "mon-old") : undefined;
    expect(item).toMatchObject({ scope: "device", prefix: "cmd_", state: "active", owner: { email: "admin-first@example.test" } });
    expect((await revokeToken(item!.id, { kind: "system", what: "test" })).ok).toBe(true);
    expect(await actorFromAuthorization(`Bearer ${OLD_TOKEN}`)).toMatchObject({ ok: false, message: expect.stringMatching(/was revoked at/) });
  });

  it("a token's monitor cannot be changed afterwards (the refusal trigger now covers monitorId)", async () => {
    await expect(upgraded.db.exec(`UPDATE "ApiToken" SET "monitorId" = NULL`)).rejects.toThrow(/monitor and expiry cannot change/);
  });

  it("in a database with no enabled administrator nothing is migrated (the old token is then refused: issue a new one with --monitor)", async () => {
    const m = migrations();
    const bare = await openDatabase("noadmin");
    try {
      for (const sql of m.before) await bare.db.exec(sql);
      await bare.db.exec(user("reviewer", "reviewer", false, "2026-01-01T00:00:00Z"));
      await bare.db.exec(monitor("mon-old", OLD_TOKEN));
      await bare.db.exec(m.upgrade);
      expect(await bare.db.all(`SELECT "id" FROM "ApiToken"`)).toEqual([]);
    } finally {
      await bare.db.close();
    }
  }, 120_000);
});
