// `npm run demo:reset -- --yes`: deletes the SQLite database named by DATABASE_URL (default
// data/corelag.db), every record and the audit log with it, then migrates a new one and loads the demo.
// The audit log is append-only, so removing single records is not possible; this starts over. Stop the
// server first: it holds the file open.
import { existsSync, rmSync } from "node:fs";
import { databaseFile, databaseUrl } from "../lib/db/env";
import { migrateDatabase } from "../lib/db/migrate";

async function main(): Promise<number> {
  const url = databaseUrl();
  const file = databaseFile(url);
  if (!process.argv.includes("--yes")) {
    console.error(`demo:reset deletes ${file} and every record in it (reviews, sign-offs, the audit log). Run it again with --yes: npm run demo:reset -- --yes`);
    return 2;
  }
  for (const f of [file, `${file}-journal`, `${file}-wal`, `${file}-shm`]) if (existsSync(f)) rmSync(f);
  migrateDatabase(url);
  // the demo accounts first: the demo monitor's device token belongs to the first administrator
  const { createDemoAccounts } = await import("../lib/services/users");
  const accounts = await createDemoAccounts({ kind: "system", what: "demo" });
  const { loadDemoIfEmpty } = await import("../lib/services/demo");
  await loadDemoIfEmpty();
  console.log(`corelag: ${file} recreated with the demo; start the server with npm start`);
  if (accounts.length > 0) {
    console.log("corelag: demo accounts (shown once; give them new passwords (Users page, or corelag user set-password) or disable them before real use):");
    for (const a of accounts) console.log(`  ${a.role.padEnd(9)} ${a.email.padEnd(24)} password: ${a.password}`);
  }
  return 0;
}

main().then(
  (code) => process.exit(code),
  (e: unknown) => {
    console.error(`demo:reset: ${e instanceof Error ? e.message : String(e)}`);
    process.exit(1);
  },
);
