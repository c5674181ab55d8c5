import { spawnSync } from "node:child_process";
import { mkdirSync } from "node:fs";
import path from "node:path";
import { databaseFile, databaseKind, redactUrl } from "./env";

const ROOT = path.resolve(__dirname, "..", "..");

/**
 * Applies the committed migrations. SQLite: creates the file's folder and runs `prisma migrate deploy`.
 * PostgreSQL: runs lib/db/pgMigrate.ts in a child process (this function stays synchronous for its
 * callers) on prisma/postgres/migrations. Idempotent: an up-to-date database is left as it is.
 */
export function migrateDatabase(url: string): void {
  const env = { ...process.env, DATABASE_URL: url, CHECKPOINT_DISABLE: "1", PRISMA_HIDE_UPDATE_MESSAGE: "1" };
  const res =
    databaseKind(url) === "postgres"
      ? spawnSync(process.execPath, [path.join(ROOT, "node_modules", "tsx", "dist", "cli.mjs"), path.join(ROOT, "lib", "db", "pgMigrate.ts")], { cwd: ROOT, env, encoding: "utf8" })
      : (mkdirSync(path.dirname(databaseFile(url)), { recursive: true }),
        spawnSync(process.execPath, [path.join(ROOT, "node_modules", "prisma", "build", "index.js"), "migrate", "deploy"], { cwd: ROOT, env, encoding: "utf8" }));
  if (res.status !== 0) {
    throw new Error(`database migration failed (${redactUrl(url)}):\n${res.stdout}\n${res.stderr}`);
  }
}
