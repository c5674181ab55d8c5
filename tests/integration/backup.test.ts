import { spawn, spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { newPgDatabaseUrl, testDatabaseKind, testDatabaseUrl } from "../helpers/database";
import { TEST_ACTOR } from "../helpers/accounts";

// `corelag backup` while writes go on, `corelag restore` into an empty database, and `corelag verify` on the
// restored copy (issue 14), through the bundled CLI, on SQLite and (npm run test:pg) PostgreSQL.
const ROOT = path.resolve(__dirname, "../..");
const dir = mkdtempSync(path.join(tmpdir(), "corelag-backup-"));
const url = testDatabaseUrl(dir, "source.db");
process.env.DATABASE_URL = url;
const kind = testDatabaseKind();
const keyFile = kind === "sqlite" ? `${path.join(dir, "source.db")}.key` : process.env.CORELAG_SIGNING_KEY_FILE!;
const DEMO = path.join(__dirname, "../../public/demo");

function corelag(args: string[], env: Record<string, string>): Promise<{ status: number | null; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, [path.join(ROOT, "dist/cli/corelag.mjs"), ...args], { cwd: ROOT, env: { ...process.env, ...env } });
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (d) => (stdout += d));
    child.stderr.on("data", (d) => (stderr += d));
    child.on("exit", (status) => resolve({ status, stdout, stderr }));
  });
}

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  const { createTrace } = await import("@/lib/db/traces");
  const { importCsv } = await import("@/lib/trace");
  const bytes = readFileSync(path.join(DEMO, "route7-tote3.csv"));
  await createTrace({ name: "before the backup", fileName: "route7-tote3.csv", bytes, imported: importCsv(bytes), actor: TEST_ACTOR });
}, 180_000);

afterAll(async () => {
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

describe(`backup and restore on ${kind}`, () => {
  it("a backup taken while definitions are being written restores into an empty database that verifies", async () => {
    const { createDefinition } = await import("@/lib/db/definitions");
    const limits = JSON.parse(readFileSync(path.join(DEMO, "ready-meal.limits.json"), "utf8"));
    let writing = true;
    let written = 0;
    const writer = (async () => {
      while (writing) {
        await createDefinition("limits", { ...limits, name: `written during the backup ${written++}` }, TEST_ACTOR);
        // SQLite's driver is synchronous: yield to timers and the CLI's output between writes
        await new Promise((r) => setImmediate(r));
      }
    })();
    await new Promise((r) => setTimeout(r, 300));
    const out = path.join(dir, kind === "sqlite" ? "copy.sqlite" : "copy.pgdump");
    const backup = await corelag(["backup", "--out", out], { DATABASE_URL: url });
    await new Promise((r) => setTimeout(r, 300));
    writing = false;
    await writer;
    expect(backup.stderr).toBe("");
    expect(backup.status).toBe(0);
    const report = JSON.parse(backup.stdout) as { database: string; out: string; bytes: number; sha256: string; head_seq: number };
    expect(report).toMatchObject({ database: kind, out });
    expect(existsSync(out)).toBe(true);
    expect(written).toBeGreaterThan(1); // writes went on around the backup

    // a second backup never overwrites the first
    const again = await corelag(["backup", "--out", out], { DATABASE_URL: url });
    expect(again.status).toBe(2);
    expect(again.stderr).toContain("already exists");

    const target = kind === "sqlite" ? `file:${path.join(dir, "restored.db")}` : newPgDatabaseUrl("restored");
    const env = { DATABASE_URL: target, CORELAG_SIGNING_KEY_FILE: keyFile };
    const restored = await corelag(["restore", out], env);
    expect(restored.stderr).toBe("");
    expect(restored.status).toBe(0);
    const verify = await corelag(["verify"], env);
    expect(verify.status).toBe(0);
    const v = JSON.parse(verify.stdout) as { ok: boolean; head: { seq: number } };
    expect(v.ok).toBe(true);
    // the copy holds the chain as of one moment: the key, the trace, and the definitions written before it
    const { db } = await import("@/lib/db/client");
    const sourceEntries = await db.auditEntry.count();
    expect(v.head.seq).toBeGreaterThanOrEqual(2);
    expect(v.head.seq).toBeLessThanOrEqual(sourceEntries);
    if (kind === "sqlite") expect(v.head.seq).toBe(report.head_seq); // SQLite reports the copy's own head

    // restore refuses a database that is not empty, and leaves it as it was
    const twice = await corelag(["restore", out], env);
    expect(twice.status).toBe(2);
    expect(twice.stderr).toMatch(/already exists|is not empty/);
    expect((await corelag(["verify"], env)).status).toBe(0);
  }, 300_000);

  it("restore refuses a backup of the other kind of database, naming both", () => {
    const sqliteCopy = path.join(dir, "other-kind.sqlite");
    // a SQLite file into a PostgreSQL URL, or (on SQLite) a non-backup file
    const bogus = path.join(dir, "not-a-backup.txt");
    spawnSync("sh", ["-c", `printf 'time,air_C\\n' > '${bogus}'`]);
    const r = spawnSync(process.execPath, [path.join(ROOT, "dist/cli/corelag.mjs"), "restore", bogus], { cwd: ROOT, encoding: "utf8", env: { ...process.env, DATABASE_URL: `file:${path.join(dir, "never.db")}` } });
    expect(r.status).toBe(2);
    expect(r.stderr).toContain("is neither a SQLite backup nor a pg_dump archive");
    expect(existsSync(path.join(dir, "never.db"))).toBe(false);
    if (kind === "postgres") {
      const copy = spawnSync(process.execPath, [path.join(ROOT, "dist/cli/corelag.mjs"), "restore", path.join(dir, "copy.pgdump")], { cwd: ROOT, encoding: "utf8", env: { ...process.env, DATABASE_URL: `file:${sqliteCopy}` } });
      expect(copy.status).toBe(2);
      expect(copy.stderr).toContain("is a PostgreSQL (pg_dump) backup but DATABASE_URL names a SQLite database");
    }
  });
});
