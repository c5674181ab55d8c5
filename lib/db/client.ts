// The one Prisma client of the application. Everything that touches the database imports `db` from here.
// DATABASE_URL chooses the database: `file:` is SQLite (better-sqlite3), `postgresql://` is PostgreSQL (pg).
// The PostgreSQL client is generated from prisma/postgres/schema.prisma (made from the one source schema by
// `npm run db:pg`); both expose the same models, so the rest of lib/db is written once against one type.
import { PrismaBetterSQLite3 } from "@prisma/adapter-better-sqlite3";
import { PrismaClient } from "../../generated/prisma/client";
import { PrismaClient as PgPrismaClient } from "../../generated/prisma-pg/client";
import { databaseKind, databaseUrl } from "./env";
import { guardTransactions } from "./guardTransactions";
import { pgAdapter } from "./pgAdapter";
import { retryBusy } from "./busy";

const globalForPrisma = globalThis as unknown as { corelagPrisma?: PrismaClient };

/**
 * The SQLite driver adapter with the connection settings every connection gets:
 * - WAL journal: readers do not wait for the writer, so pages stay quick while a review is stored
 *   (persistent in the file; SQLite folds the log back in when the last connection closes);
 * - a 10 s busy timeout (better-sqlite3's `timeout`): a writer waits for another's lock instead of
 *   failing at once with SQLITE_BUSY.
 */
class SqliteAdapter extends PrismaBetterSQLite3 {
  override async connect() {
    const connection = await super.connect();
    await connection.executeScript("PRAGMA journal_mode = WAL;");
    return connection;
  }
}

/**
 * Transactions wait their turn: writers queue behind the audit chain's lock (PostgreSQL) or the one
 * writer (SQLite), so a burst of uploads must not fail on Prisma's 2 s start / 5 s run defaults.
 */
const transactionOptions = { maxWait: 60_000, timeout: 120_000 };

/** PostgreSQL connections per app instance (several instances share one server). */
const PG_POOL_MAX = 10;

function makeClient(): PrismaClient {
  const url = databaseUrl();
  const client =
    databaseKind(url) === "postgres"
      ? (new PgPrismaClient({ adapter: pgAdapter(url, { max: PG_POOL_MAX }), transactionOptions }) as unknown as PrismaClient)
      : // guardTransactions: a failed write (a full disk) must not leave the connection locked for every later one.
        new PrismaClient({ adapter: guardTransactions(new SqliteAdapter({ url, timeout: 10_000 })), transactionOptions });
  return withBusyRetry(client);
}

/**
 * Every interactive transaction (`db.$transaction(async (tx) => …)`, the form every write uses) is run
 * again, whole, when the database was busy, a bounded number of times (lib/db/busy.ts); then the caller
 * gets StorageBusyError, never SQLITE_BUSY or a unique-constraint message.
 */
function withBusyRetry(client: PrismaClient): PrismaClient {
  const transaction = client.$transaction.bind(client) as (...args: unknown[]) => Promise<unknown>;
  (client as unknown as { $transaction: unknown }).$transaction = (arg: unknown, options?: unknown) =>
    typeof arg === "function" ? retryBusy(() => transaction(arg, options)) : transaction(arg, options);
  return client;
}

/** Which database this process writes to. */
export const dbKind = () => databaseKind(databaseUrl());

// Reused across hot reloads in development, where modules are re-evaluated.
export const db: PrismaClient = globalForPrisma.corelagPrisma ?? makeClient();
if (process.env.NODE_ENV !== "production") globalForPrisma.corelagPrisma = db;
