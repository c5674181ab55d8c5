import path from "node:path";
import { z } from "zod";

const envSchema = z.object({
  /** SQLite database, as a file: URL; relative paths are relative to the working directory. */
  DATABASE_URL: z
    .string()
    .regex(/^file:.+/, { message: "DATABASE_URL must be a SQLite file: URL, e.g. file:data/corelag.db" })
    .default(`file:${path.join("data", "corelag.db")}`),
});

export function databaseUrl(): string {
  const parsed = envSchema.safeParse(process.env);
  if (!parsed.success) throw new Error(`Invalid environment: ${parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ")}`);
  return parsed.data.DATABASE_URL;
}

/** Filesystem path of the SQLite file named by a file: URL. */
export function databaseFile(url = databaseUrl()): string {
  return path.resolve(url.replace(/^file:/, ""));
}
