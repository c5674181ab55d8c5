// The database an integration test runs on. By default a SQLite file in the test's temporary folder; with
// CORELAG_TEST_DB=postgres (npm run test:pg, run by CI with a throwaway server) a new PostgreSQL database on
// the server CORELAG_TEST_PG_URL names, created by the first migration. Tests written with this helper run
// unchanged on both.
import { randomBytes } from "node:crypto";
import path from "node:path";

export type TestDatabaseKind = "sqlite" | "postgres";

export function testDatabaseKind(): TestDatabaseKind {
  return process.env.CORELAG_TEST_DB === "postgres" ? "postgres" : "sqlite";
}

/** The PostgreSQL server for tests (any database on it; e.g. postgresql://postgres@127.0.0.1:5433/postgres), or null. */
export function testPgServer(): string | null {
  return process.env.CORELAG_TEST_PG_URL || null;
}

/** A URL for a new, empty PostgreSQL database on the test server. */
export function newPgDatabaseUrl(label = "t"): string {
  const server = testPgServer();
  if (!server) throw new Error("CORELAG_TEST_PG_URL is not set: start a PostgreSQL server for tests (see .ci/run)");
  const u = new URL(server);
  u.pathname = `/corelag_${label.replace(/[^a-z0-9]/gi, "").toLowerCase().slice(0, 20)}_${randomBytes(5).toString("hex")}`;
  return u.toString();
}

/**
 * The URL of this test's database: `file:<dir>/<file>` on SQLite, a new database on PostgreSQL (whose
 * signing key then lives in `dir`, as it would beside a SQLite file).
 */
export function testDatabaseUrl(dir: string, file: string): string {
  if (testDatabaseKind() === "sqlite") return `file:${path.join(dir, file)}`;
  process.env.CORELAG_SIGNING_KEY_FILE ??= path.join(dir, `${file}.key`);
  return newPgDatabaseUrl(file);
}

/** SQL that drops one of the refusal triggers, as someone with direct access to the database would. */
export function dropTriggerSql(trigger: string, table: string): string {
  return testDatabaseKind() === "postgres" ? `DROP TRIGGER "${trigger}" ON "${table}"` : `DROP TRIGGER "${trigger}"`;
}
