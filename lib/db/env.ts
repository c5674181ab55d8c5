import path from "node:path";
import { config } from "../config";

/** The database URL of this process (environment, else .env; see lib/config). */
export function databaseUrl(): string {
  return config().DATABASE_URL;
}

/** Filesystem path of the SQLite file named by a file: URL. */
export function databaseFile(url = databaseUrl()): string {
  return path.resolve(url.replace(/^file:/, ""));
}
