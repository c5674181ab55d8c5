// Prisma CLI configuration for the generated PostgreSQL schema (prisma/postgres/schema.prisma): the
// JavaScript schema engine with the pg driver adapter. Used by `npm run db:pg` to write the PostgreSQL
// migrations and by `prisma generate` for the PostgreSQL client; migrations are applied by lib/db/pgMigrate.ts.
import path from "node:path";
import { defineConfig } from "prisma/config";
import { offlinePgAdapter, pgAdapter } from "../../lib/db/pgAdapter";

process.env.CHECKPOINT_DISABLE = "1";

// The WebAssembly engine leaves long timers armed; unref them so the CLI exits when its work is done.
const originalSetTimeout = globalThis.setTimeout;
globalThis.setTimeout = ((fn: (...a: unknown[]) => void, ms?: number, ...args: unknown[]) => {
  const t = originalSetTimeout(fn, ms, ...args);
  if ((ms ?? 0) >= 10_000 && typeof t === "object" && t && "unref" in t) t.unref();
  return t;
}) as typeof setTimeout;

// The generator's `migrate diff` between datamodels needs no server (CORELAG_PG_OFFLINE=1, or no PostgreSQL
// DATABASE_URL); with a PostgreSQL DATABASE_URL, commands such as `migrate status` talk to that server.
const url = process.env.DATABASE_URL;
const online = !process.env.CORELAG_PG_OFFLINE && !!url && /^postgres(ql)?:/.test(url);

export default defineConfig({
  experimental: { adapter: true },
  engine: "js",
  schema: path.join(__dirname, "schema.prisma"),
  async adapter() {
    return online ? pgAdapter(url!) : offlinePgAdapter();
  },
});
