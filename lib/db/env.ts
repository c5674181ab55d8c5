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

const keyEnvSchema = z.object({
  /** an Ed25519 private key, PEM or base64 PKCS#8 DER (for teams that keep it in a secret store) */
  CORELAG_SIGNING_KEY: z.string().min(1).optional(),
  /** path of the key file; defaults to the database file's path with ".key" appended */
  CORELAG_SIGNING_KEY_FILE: z.string().min(1).optional(),
});

/** Where the audit signing key comes from: the environment, or a key file (by default beside the database). */
export function signingKeySource(url = databaseUrl()): { kind: "env" } | { kind: "file"; path: string } {
  const parsed = keyEnvSchema.safeParse(process.env);
  if (!parsed.success) throw new Error(`Invalid environment: ${parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ")}`);
  if (parsed.data.CORELAG_SIGNING_KEY) return { kind: "env" };
  return { kind: "file", path: path.resolve(parsed.data.CORELAG_SIGNING_KEY_FILE ?? `${databaseFile(url)}.key`) };
}
