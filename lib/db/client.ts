// The one Prisma client of the application. Everything that touches the database imports `db` from here.
import { PrismaBetterSQLite3 } from "@prisma/adapter-better-sqlite3";
import { PrismaClient } from "../../generated/prisma/client";
import { databaseUrl } from "./env";

const globalForPrisma = globalThis as unknown as { corelagPrisma?: PrismaClient };

function makeClient(): PrismaClient {
  // Wait up to 10 s for another writer's lock before failing with SQLITE_BUSY (better-sqlite3's `timeout`).
  return new PrismaClient({ adapter: new PrismaBetterSQLite3({ url: databaseUrl(), timeout: 10_000 }) });
}

// Reused across hot reloads in development, where modules are re-evaluated.
export const db: PrismaClient = globalForPrisma.corelagPrisma ?? makeClient();
if (process.env.NODE_ENV !== "production") globalForPrisma.corelagPrisma = db;
