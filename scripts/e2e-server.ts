// Starts `next start` for the end-to-end tests on a fresh, migrated SQLite file (no demo data).
import { mkdirSync, rmSync } from "node:fs";
import { spawn } from "node:child_process";
import path from "node:path";
import { migrateDatabase } from "../lib/db/migrate";

const port = process.argv[2] ?? "3210";
const dir = path.resolve("test-results", "e2e-db");
rmSync(dir, { recursive: true, force: true });
mkdirSync(dir, { recursive: true });
const url = `file:${path.join(dir, "e2e.db")}`;
migrateDatabase(url);

const server = spawn(process.execPath, [path.join("node_modules", "next", "dist", "bin", "next"), "start", "-H", "127.0.0.1", "-p", port], {
  env: { ...process.env, DATABASE_URL: url, NEXT_TELEMETRY_DISABLED: "1" },
  stdio: "inherit",
});
// Stop the server with this process, whichever way it ends.
for (const sig of ["SIGINT", "SIGTERM", "SIGHUP"] as const) process.on(sig, () => server.kill("SIGTERM"));
process.on("exit", () => server.kill("SIGTERM"));
server.on("exit", (code) => process.exit(code ?? 0));
