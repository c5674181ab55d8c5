// The one Prisma client of the application. Everything that touches the database imports `db` from here.
import { PrismaBetterSQLite3 } from "@prisma/adapter-better-sqlite3";
import { PrismaClient } from "../../generated/prisma/client";
import { databaseUrl } from "./env";
import { guardTransactions } from "./guardTransactions";

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

function makeClient(): PrismaClient {
  // guardTransactions: a failed write (a full disk) must not leave the connection locked for every later one.
  return new PrismaClient({ adapter: guardTransactions(new SqliteAdapter({ url: databaseUrl(), timeout: 10_000 })) });
}

// Reused across hot reloads in development, where modules are re-evaluated.
export const db: PrismaClient = globalForPrisma.corelagPrisma ?? makeClient();
if (process.env.NODE_ENV !== "production") globalForPrisma.corelagPrisma = db;
