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

/** Where the audit signing key comes from: the configuration (a secret), or a key file (by default beside the database). */
export function signingKeySource(url = databaseUrl()): { kind: "env"; text: string } | { kind: "file"; path: string } {
  const c = config();
  if (c.CORELAG_SIGNING_KEY) return { kind: "env", text: c.CORELAG_SIGNING_KEY };
  return { kind: "file", path: path.resolve(c.CORELAG_SIGNING_KEY_FILE ?? `${databaseFile(url)}.key`) };
}
