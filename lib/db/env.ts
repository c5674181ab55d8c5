import path from "node:path";
import { config } from "../config";

/** The database URL of this process (environment, else .env; see lib/config). */
export function databaseUrl(): string {
  return config().DATABASE_URL;
}

export type DatabaseKind = "sqlite" | "postgres";

/** Which database a URL names: `file:` is SQLite, `postgresql://` (or `postgres://`) is PostgreSQL. */
export function databaseKind(url = databaseUrl()): DatabaseKind {
  return /^postgres(ql)?:\/\//.test(url) ? "postgres" : "sqlite";
}

/** Filesystem path of the SQLite file named by a file: URL. */
export function databaseFile(url = databaseUrl()): string {
  if (databaseKind(url) === "postgres") throw new Error("this needs a SQLite database file; DATABASE_URL names a PostgreSQL server");
  return path.resolve(url.replace(/^file:/, ""));
}

/**
 * The path the files that belong beside a database start with (its default signing key `<base>.key`,
 * its anchor log `<base>.anchors.jsonl`): the SQLite file itself, or for PostgreSQL
 * `data/pg-<host>-<port>-<database>` in the working directory. Instances on several machines share a
 * PostgreSQL database but not this folder: give them the same key with CORELAG_SIGNING_KEY(_FILE).
 */
export function localStateBase(url = databaseUrl()): string {
  if (databaseKind(url) === "sqlite") return databaseFile(url);
  const u = new URL(url);
  const name = `pg-${u.hostname || "localhost"}-${u.port || "5432"}-${decodeURIComponent(u.pathname.slice(1))}`.replace(/[^A-Za-z0-9._-]/g, "_");
  return path.resolve("data", name);
}

/** Where the audit signing key comes from: the configuration (a secret), or a key file (by default beside the database). */
export function signingKeySource(url = databaseUrl()): { kind: "env"; text: string } | { kind: "file"; path: string } {
  const c = config();
  if (c.CORELAG_SIGNING_KEY) return { kind: "env", text: c.CORELAG_SIGNING_KEY };
  return { kind: "file", path: path.resolve(c.CORELAG_SIGNING_KEY_FILE ?? `${localStateBase(url)}.key`) };
}

/** The URL without its password, for messages. */
export function redactUrl(url: string): string {
  return url.replace(/(\/\/[^:/@]*:)[^@]*@/, "$1***@");
}
