import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir, userInfo } from "node:os";
import path from "node:path";
import { createRequire } from "node:module";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startServer, type RunningServer } from "../helpers/server";
import { seedAccounts, signInCookie, TEST_EMAIL, TEST_PASSWORD } from "../helpers/accounts";

// Sign-in over real HTTP (issue 13): refused sign-ins are counted per account and per address, audited,
// and a locked account says so; every entry names who acted (the user, or cli:<os user> for the CLI).
const ROOT = path.resolve(__dirname, "..", "..");
const dir = mkdtempSync(path.join(tmpdir(), "corelag-signin-"));
const dbFile = path.join(dir, "signin.db");
const dbUrl = `file:${dbFile}`;
let server: RunningServer;

type Sqlite = { prepare(sql: string): { all(...a: unknown[]): unknown[] }; close(): void };
const Database = createRequire(__filename)("better-sqlite3") as new (file: string, options: { readonly: boolean }) => Sqlite;
const entries = (where: string, ...args: unknown[]) => {
  const db = new Database(dbFile, { readonly: true });
  try {
    return db.prepare(`SELECT seq, action, entity, entityId, actor, details FROM "AuditEntry" WHERE ${where} ORDER BY seq`).all(...args) as Array<{ action: string; entityId: string; actor: string; details: string }>;
  } finally {
    db.close();
  }
};

/** POST /api/session from a given client address (the first X-Forwarded-For hop). */
const attempt = (email: string, password: string, address: string) =>
  fetch(`${server.url}/api/session`, { method: "POST", headers: { "content-type": "application/json", "x-forwarded-for": address }, body: JSON.stringify({ email, password }) });

beforeAll(async () => {
  const migrate = spawnSync(process.execPath, [path.join(ROOT, "node_modules", "prisma", "build", "index.js"), "migrate", "deploy"], { cwd: ROOT, env: { ...process.env, DATABASE_URL: dbUrl }, encoding: "utf8" });
  expect(migrate.status, migrate.stderr).toBe(0);
  seedAccounts(dbUrl);
  server = await startServer({ DATABASE_URL: dbUrl }, "/sign-in");
}, 120_000);

afterAll(async () => {
  await server?.stop();
  rmSync(dir, { recursive: true, force: true });
});

describe("sign-in lockout", () => {
  it("locks an account after 5 refused sign-ins (the right password is then refused too, saying so); other accounts still sign in", async () => {
    // addresses from the documentation range (RFC 5737, 203.0.113.0/24)
    for (let i = 1; i <= 4; i++) expect((await attempt(TEST_EMAIL.designer, "wrong-password-" + i, "203.0.113.10")).status).toBe(401);
    const fifth = await attempt(TEST_EMAIL.designer, "wrong-password-5", "203.0.113.10");
    expect(fifth.status).toBe(429);
    expect(((await fifth.json()) as { error: string }).error).toContain("This account is now locked for 15 minutes");
    const right = await attempt(TEST_EMAIL.designer, TEST_PASSWORD, "203.0.113.11");
    expect(right.status).toBe(429);
    expect(((await right.json()) as { error: string }).error).toMatch(/^This account is locked after 5 failed sign-ins; try again after \d\d:\d\d UTC/);
    expect((await attempt(TEST_EMAIL.reviewer, TEST_PASSWORD, "203.0.113.10")).status).toBe(200);
    const refused = entries(`action = 'sign-in-refused'`);
    expect(refused).toHaveLength(6);
    expect(refused.map((e) => JSON.parse(e.details).reason)).toEqual(["wrong-password", "wrong-password", "wrong-password", "wrong-password", "wrong-password", "locked"]);
    expect(new Set(refused.map((e) => e.actor))).toEqual(new Set(["system:sign-in"]));
  });

  it("refuses an address after 20 refused sign-ins within 15 minutes, whatever the accounts", async () => {
    for (let i = 0; i < 20; i++) expect((await attempt(`nobody${i}@example.com`, "wrong-password", "203.0.113.20")).status).toBe(401);
    const r = await attempt(TEST_EMAIL.auditor, TEST_PASSWORD, "203.0.113.20");
    expect(r.status).toBe(429);
    expect(((await r.json()) as { error: string }).error).toMatch(/^Too many failed sign-ins from this address/);
    expect((await attempt(TEST_EMAIL.auditor, TEST_PASSWORD, "203.0.113.21")).status).toBe(200);
  });
});

describe("the audit log names who acted", () => {
  it("an upload by the reviewer is recorded with the reviewer's name and account; a user added from the CLI with the OS user", async () => {
    const cookie = await signInCookie(server.url, "reviewer");
    const form = new FormData();
    form.append("file", new File(["time,air_C\n2026-06-16T00:00:00Z,4\n2026-06-16T00:10:00Z,5\n"], "actor.csv"));
    form.append("options", "{}");
    const up = await fetch(`${server.url}/api/traces`, { method: "POST", body: form, headers: { cookie, origin: server.url } });
    expect(up.status).toBe(201);
    const { id } = (await up.json()) as { id: string };
    const [imp] = entries(`action = 'import' AND entityId = ?`, id);
    expect(imp!.actor).toBe("Tomas Reviewer (demo) <reviewer@corelag.test>");
    expect(JSON.parse(imp!.details).actor).toMatchObject({ kind: "user", name: "Tomas Reviewer (demo)" });

    const cli = spawnSync(process.execPath, [path.join(ROOT, "dist", "cli", "corelag.mjs"), "user", "add", "--email", "new.auditor@example.com", "--name", "New Auditor", "--role", "auditor", "--password-stdin"], {
      cwd: ROOT, env: { ...process.env, DATABASE_URL: dbUrl }, input: "a-long-password-1\n", encoding: "utf8",
    });
    expect(cli.status, cli.stderr).toBe(0);
    expect(JSON.parse(cli.stdout)).toMatchObject({ email: "new.auditor@example.com", role: "auditor", disabled: false, demo: false });
    const [made] = entries(`action = 'create' AND entity = 'user' AND details LIKE ?`, "%new.auditor@example.com%");
    expect(made!.actor).toBe(`cli:${userInfo().username}`);
    // and the new account signs in with that password
    expect((await attempt("new.auditor@example.com", "a-long-password-1", "203.0.113.30")).status).toBe(200);
  });
});
