import { spawnSync } from "node:child_process";
import { mkdirSync } from "node:fs";
import path from "node:path";
import { databaseFile } from "./env";

const ROOT = path.resolve(__dirname, "..", "..");

/**
 * Creates the SQLite file's folder and applies the committed migrations (`prisma migrate deploy`).
 * Idempotent: an up-to-date database is left as it is.
 */
export function migrateDatabase(url: string): void {
  mkdirSync(path.dirname(databaseFile(url)), { recursive: true });
  const res = spawnSync(process.execPath, [path.join(ROOT, "node_modules", "prisma", "build", "index.js"), "migrate", "deploy"], {
    cwd: ROOT,
    env: { ...process.env, DATABASE_URL: url, CHECKPOINT_DISABLE: "1", PRISMA_HIDE_UPDATE_MESSAGE: "1" },
    encoding: "utf8",
  });
  if (res.status !== 0) {
    throw new Error(`database migration failed (${url}):\n${res.stdout}\n${res.stderr}`);
  }
}
