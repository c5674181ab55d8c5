// Starts `next start` for the end-to-end tests on a fresh, migrated SQLite file (no demo data).
import { mkdirSync, rmSync } from "node:fs";
import { spawn, spawnSync } from "node:child_process";
import { TEST_PASSWORD as E2E_PASSWORD } from "../tests/helpers/accounts";
import path from "node:path";
import { migrateDatabase } from "../lib/db/migrate";

const port = process.argv[2] ?? "3210";
const dir = path.resolve("test-results", "e2e-db");
rmSync(dir, { recursive: true, force: true });
mkdirSync(dir, { recursive: true });
const url = `file:${path.join(dir, "e2e.db")}`;
migrateDatabase(url);
// One account per role with the test password (tests/helpers/accounts.ts TEST_PASSWORD; the e2e auth setup signs in with it).
const seeded = spawnSync(process.execPath, [path.join("node_modules", "tsx", "dist", "cli.mjs"), path.join("scripts", "seed-accounts.ts")], {
  env: { ...process.env, DATABASE_URL: url, CORELAG_DEMO_PASSWORD: E2E_PASSWORD },
  stdio: "inherit",
});
if (seeded.status !== 0) process.exit(seeded.status ?? 1);

const server = spawn(process.execPath, [path.join("node_modules", "next", "dist", "bin", "next"), "start", "-H", "127.0.0.1", "-p", port], {
  env: { ...process.env, DATABASE_URL: url, NEXT_TELEMETRY_DISABLED: "1" },
  stdio: "inherit",
});
// Stop the server with this process, whichever way it ends.
for (const sig of ["SIGINT", "SIGTERM", "SIGHUP"] as const) process.on(sig, () => server.kill("SIGTERM"));
process.on("exit", () => server.kill("SIGTERM"));
server.on("exit", (code) => process.exit(code ?? 0));
