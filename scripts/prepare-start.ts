// Runs before `npm start`: creates and migrates the SQLite database, loads the demo on first run,
// and builds the app when no build exists yet.
import { existsSync } from "node:fs";
import { spawnSync } from "node:child_process";
import path from "node:path";
import { databaseUrl } from "../lib/db/env";
import { migrateDatabase } from "../lib/db/migrate";

async function main(): Promise<void> {
  const url = databaseUrl();
  migrateDatabase(url);
  const { loadDemoIfEmpty } = await import("../lib/services/demo");
  const demo = await loadDemoIfEmpty();
  console.log(`corelag: database ${url} migrated; demo ${demo === "loaded" ? "loaded" : "already present or not needed"}`);
  if (!existsSync(path.join(".next", "BUILD_ID"))) {
    console.log("corelag: no build found, running next build (about 30 s)…");
    const res = spawnSync(process.execPath, [path.join("node_modules", "next", "dist", "bin", "next"), "build"], { stdio: "inherit" });
    if (res.status !== 0) process.exit(res.status ?? 1);
  }
}

main().then(
  () => process.exit(0),
  (e: unknown) => {
    console.error(e instanceof Error ? e.message : e);
    process.exit(1);
  },
);
