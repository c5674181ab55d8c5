// Configuration, read once and the same for every entry point: `npm start`'s preparation, the CLI,
// the Prisma CLI (migrations) and the server. Variables come from the environment and, for those the
// environment does not set, from the `.env` file in the working directory (or the file named by
// CORELAG_ENV_FILE); the environment wins, as it does for Next.js's own .env loading.
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import { parseEnv } from "node:util";
import { z } from "zod";

const configSchema = z.object({
  /** The database: a SQLite file: URL; a relative path is relative to the working directory. */
  DATABASE_URL: z
    .string()
    .regex(/^file:.+/, { message: "DATABASE_URL must be a SQLite file: URL, e.g. file:data/corelag.db" })
    .default(`file:${path.join("data", "corelag.db")}`),
  /** The audit signing key itself, PEM or base64 PKCS#8 DER (for teams that keep it in a secret store). */
  CORELAG_SIGNING_KEY: z.string().min(1).optional(),
  /** Path of the audit signing key file; by default the database file's path with ".key" appended. */
  CORELAG_SIGNING_KEY_FILE: z.string().min(1).optional(),
  /** Where `corelag anchor --post` sends the chain's head (an http(s) URL; run it daily from cron). */
  CORELAG_ANCHOR_WEBHOOK: z.url({ protocol: /^https?$/, message: "CORELAG_ANCHOR_WEBHOOK must be an http(s) URL" }).optional(),
});
export type Config = z.infer<typeof configSchema>;

/** The .env file this process reads: CORELAG_ENV_FILE, else `.env` in the working directory. */
export function envFilePath(env: Readonly<Record<string, string | undefined>> = process.env): string {
  return path.resolve(env.CORELAG_ENV_FILE ?? ".env");
}

/** Variables from the .env file under those of the environment (the environment wins). */
export function mergedEnv(env: Readonly<Record<string, string | undefined>> = process.env): Record<string, string | undefined> {
  const file = envFilePath(env);
  if (!existsSync(file)) {
    if (env.CORELAG_ENV_FILE) throw new Error(`CORELAG_ENV_FILE: ${file} does not exist`);
    return { ...env };
  }
  return { ...parseEnv(readFileSync(file, "utf8")), ...env };
}

/** Validates the merged variables; throws one message naming every variable at fault. */
export function parseConfig(vars: Record<string, string | undefined>): Config {
  const parsed = configSchema.safeParse(vars);
  if (!parsed.success) {
    throw new Error(`invalid configuration: ${parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ")}`);
  }
  return parsed.data;
}

let cached: Config | undefined;
/** The configuration of this process, read once. */
export function config(): Config {
  cached ??= parseConfig(mergedEnv());
  return cached;
}
