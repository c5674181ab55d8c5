// The secret better-auth signs session cookies with: never in the database. CORELAG_AUTH_SECRET (from a
// secret store) or a file beside the database (`<database file>.auth-secret`, mode 0600, created on first
// use), the same arrangement as the audit signing key (lib/db/signingKey.ts).
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import path from "node:path";
import { config } from "../config";
import { localStateBase } from "./env";

export function authSecret(): string {
  const fromEnv = config().CORELAG_AUTH_SECRET;
  if (fromEnv) return fromEnv;
  const file = `${localStateBase()}.auth-secret`;
  if (!existsSync(file)) {
    mkdirSync(path.dirname(file), { recursive: true });
    try {
      writeFileSync(file, randomBytes(32).toString("base64url"), { mode: 0o600, flag: "wx" });
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code !== "EEXIST") throw e;
    }
  }
  const mode = statSync(file).mode & 0o777;
  if (process.platform !== "win32" && (mode & 0o077) !== 0) throw new Error(`${file}: the session secret is readable by others (mode ${mode.toString(8)}); run chmod 600 on it`);
  return readFileSync(file, "utf8").trim();
}
