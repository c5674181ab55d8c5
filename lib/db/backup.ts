// `corelag backup` and `corelag restore`: a consistent copy of the database while the app runs, and that copy
// put back into an empty database. SQLite: the online backup API (better-sqlite3's `backup`, page by page;
// writers carry on, and the copy is the database as of one moment). PostgreSQL: `pg_dump --format=custom`
// (one snapshot) and `pg_restore --single-transaction` (all or nothing; the refusal triggers are created
// after the rows are loaded). The signing key is never in a backup: keep it (CORELAG_SIGNING_KEY_FILE) apart.
import Database from "better-sqlite3";
import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { closeSync, existsSync, mkdirSync, openSync, readdirSync, readFileSync, readSync, renameSync, statSync, unlinkSync } from "node:fs";
import path from "node:path";
import pg from "pg";
import { databaseFile, databaseKind, type DatabaseKind } from "./env";
import { pgConnection } from "./pgAdapter";
import { createDatabaseIfMissing } from "./pgDatabase";

export class BackupError extends Error {}

/** better-sqlite3 clamps a step to 2^31 − 1 pages: that many is "the rest" for any database */
const ALL_PAGES = 0x7fffffff;

export interface BackupReport {
  database: DatabaseKind;
  out: string;
  bytes: number;
  sha256: string;
  /** the audit chain's newest entry in the copy */
  head_seq: number | null;
}

const sha256File = (file: string) => createHash("sha256").update(readFileSync(file)).digest("hex");

/** The first bytes of a file: "SQLite format 3\0" or pg_dump's custom format "PGDMP". */
function magic(file: string): "sqlite" | "pgdump" | null {
  const fd = openSync(file, "r");
  try {
    const b = Buffer.alloc(16);
    readSync(fd, b, 0, 16, 0);
    if (b.toString("latin1", 0, 16) === "SQLite format 3\0") return "sqlite";
    if (b.toString("latin1", 0, 5) === "PGDMP") return "pgdump";
    return null;
  } finally {
    closeSync(fd);
  }
}

/** pg_dump / pg_restore: on the PATH, else the newest of Debian's /usr/lib/postgresql/<version>/bin. */
export function postgresTool(name: "pg_dump" | "pg_restore"): string | null {
  for (const dir of (process.env.PATH ?? "").split(path.delimiter)) if (dir && existsSync(path.join(dir, name))) return path.join(dir, name);
  const root = "/usr/lib/postgresql";
  if (!existsSync(root)) return null;
  const versions = readdirSync(root).filter((v) => /^\d+$/.test(v)).sort((a, b) => Number(b) - Number(a));
  for (const v of versions) if (existsSync(path.join(root, v, "bin", name))) return path.join(root, v, "bin", name);
  return null;
}

/** Connection settings for the PostgreSQL tools, through their environment (the password never on a command line). */
function pgToolEnv(url: string): NodeJS.ProcessEnv {
  const c = pgConnection(url);
  return { ...process.env, PGHOST: String(c.host), PGPORT: String(c.port), PGDATABASE: String(c.database), ...(c.user ? { PGUSER: c.user } : {}), ...(c.password ? { PGPASSWORD: String(c.password) } : {}) };
}

async function pgHead(url: string): Promise<number | null> {
  const client = new pg.Client(pgConnection(url));
  await client.connect();
  try {
    const r = await client.query<{ seq: number | null }>(`SELECT max("seq") AS seq FROM "AuditEntry"`);
    return r.rows[0]?.seq ?? null;
  } finally {
    await client.end();
  }
}

/** A consistent copy of the database at `out` (written beside it first, then renamed, so `out` is never half a copy). */
export async function backupDatabase(url: string, out: string): Promise<BackupReport> {
  const target = path.resolve(out);
  if (existsSync(target)) throw new BackupError(`--out: ${target} already exists; a backup never overwrites a file`);
  mkdirSync(path.dirname(target), { recursive: true });
  const partial = `${target}.partial`;
  const kind = databaseKind(url);
  try {
    let head: number | null;
    if (kind === "sqlite") {
      const source = new Database(databaseFile(url), { readonly: true, fileMustExist: true });
      try {
        // all pages in one step, under one read transaction: a consistent copy however busy the writers are
        // (page-by-page steps restart whenever another connection writes, and may never finish)
        await source.backup(partial, { progress: () => ALL_PAGES });
      } finally {
        source.close();
      }
      const copy = new Database(partial, { readonly: true });
      try {
        const check = copy.prepare("PRAGMA integrity_check").pluck().get();
        if (check !== "ok") throw new BackupError(`the copy failed SQLite's integrity check: ${String(check)}`);
        head = (copy.prepare(`SELECT max("seq") FROM "AuditEntry"`).pluck().get() as number | null) ?? null;
      } finally {
        copy.close();
      }
    } else {
      const pgDump = postgresTool("pg_dump");
      if (!pgDump) throw new BackupError("pg_dump is not installed (Debian: apt-get install postgresql-client); a PostgreSQL backup needs it");
      const r = spawnSync(pgDump, ["--format=custom", "--no-owner", "--no-privileges", "--file", partial], { env: pgToolEnv(url), encoding: "utf8" });
      if (r.status !== 0) throw new BackupError(`pg_dump failed: ${(r.stderr || r.error?.message || "").trim()}`);
      head = await pgHead(url); // at least the copy's head: entries appended after the dump's snapshot are not in it
    }
    renameSync(partial, target);
    return { database: kind, out: target, bytes: statSync(target).size, sha256: sha256File(target), head_seq: head };
  } catch (e) {
    if (existsSync(partial)) unlinkSync(partial);
    throw e;
  }
}

async function pgIsEmpty(url: string): Promise<boolean> {
  const client = new pg.Client(pgConnection(url));
  await client.connect();
  try {
    const r = await client.query<{ n: string }>(`SELECT count(*)::text AS n FROM pg_tables WHERE schemaname = 'public'`);
    return r.rows[0]?.n === "0";
  } finally {
    await client.end();
  }
}

/**
 * Restores a backup into the database DATABASE_URL names, which must be empty (a SQLite file that does not
 * exist yet; a PostgreSQL database without tables, created when missing). Nothing is left half-restored.
 */
export async function restoreDatabase(url: string, file: string): Promise<{ database: DatabaseKind; from: string; head_seq: number | null }> {
  const source = path.resolve(file);
  if (!existsSync(source) || !statSync(source).isFile()) throw new BackupError(`${source}: no such backup file`);
  const format = magic(source);
  const kind = databaseKind(url);
  if (format === null) throw new BackupError(`${source}: is neither a SQLite backup nor a pg_dump archive`);
  if ((format === "sqlite") !== (kind === "sqlite")) {
    throw new BackupError(`${source} is a ${format === "sqlite" ? "SQLite" : "PostgreSQL (pg_dump)"} backup but DATABASE_URL names a ${kind === "sqlite" ? "SQLite" : "PostgreSQL"} database; restore it into the same kind`);
  }
  if (kind === "sqlite") {
    const target = databaseFile(url);
    if (existsSync(target) && statSync(target).size > 0) throw new BackupError(`DATABASE_URL: ${target} already exists; restore only into an empty database (a new path)`);
    mkdirSync(path.dirname(target), { recursive: true });
    const partial = `${target}.restoring`;
    const from = new Database(source, { readonly: true, fileMustExist: true });
    let head: number | null;
    try {
      const check = from.prepare("PRAGMA integrity_check").pluck().get();
      if (check !== "ok") throw new BackupError(`${source}: the backup fails SQLite's integrity check: ${String(check)}`);
      head = (from.prepare(`SELECT max("seq") FROM "AuditEntry"`).pluck().get() as number | null) ?? null;
      await from.backup(partial, { progress: () => ALL_PAGES });
    } catch (e) {
      if (existsSync(partial)) unlinkSync(partial);
      throw e;
    } finally {
      from.close();
    }
    renameSync(partial, target);
    return { database: kind, from: source, head_seq: head };
  }
  const pgRestore = postgresTool("pg_restore");
  if (!pgRestore) throw new BackupError("pg_restore is not installed (Debian: apt-get install postgresql-client); a PostgreSQL restore needs it");
  await createDatabaseIfMissing(url);
  if (!(await pgIsEmpty(url))) throw new BackupError(`DATABASE_URL: the PostgreSQL database ${String(pgConnection(url).database)} is not empty; restore only into an empty database`);
  const r = spawnSync(pgRestore, ["--no-owner", "--no-privileges", "--single-transaction", "--exit-on-error", "--dbname", String(pgConnection(url).database), source], { env: pgToolEnv(url), encoding: "utf8" });
  if (r.status !== 0) throw new BackupError(`pg_restore failed (nothing was restored): ${(r.stderr || r.error?.message || "").trim()}`);
  return { database: kind, from: source, head_seq: await pgHead(url) };
}
