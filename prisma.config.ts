// Prisma CLI configuration: the JavaScript schema engine with the better-sqlite3 driver adapter,
// because Prisma's native engines cannot be downloaded on these machines (see DEVELOPERS.md).
import path from "node:path";
import { defineConfig } from "prisma/config";
import { PrismaBetterSQLite3 } from "@prisma/adapter-better-sqlite3";
import { config } from "./lib/config";

process.env.CHECKPOINT_DISABLE = "1";

// The WebAssembly engine leaves long timers armed and the CLI then idles for up to a minute after
// finishing; unref long timers so the process exits when its work is done.
const originalSetTimeout = globalThis.setTimeout;
globalThis.setTimeout = ((fn: (...a: unknown[]) => void, ms?: number, ...args: unknown[]) => {
  const t = originalSetTimeout(fn, ms, ...args);
  if ((ms ?? 0) >= 10_000 && typeof t === "object" && t && "unref" in t) t.unref();
  return t;
}) as typeof setTimeout;

// The same configuration as the app and the CLI (environment, else .env), validated once.
const url = config().DATABASE_URL;

export default defineConfig({
  experimental: { adapter: true },
  engine: "js",
  schema: path.join("prisma", "schema.prisma"),
  async adapter() {
    return new PrismaBetterSQLite3({ url });
  },
});
