// Runs before `npm start`: creates and migrates the SQLite database, loads the demo on first run,
// and builds the app when no build exists yet.
import { existsSync, readFileSync, readdirSync, statSync, writeFileSync } from "node:fs";
import { createHash } from "node:crypto";
import { spawnSync } from "node:child_process";
import path from "node:path";
import { databaseUrl } from "../lib/db/env";
import { migrateDatabase } from "../lib/db/migrate";

/** A hash of everything the build is made from, so a changed checkout is rebuilt before it is served. */
function sourceStamp(): string {
  const h = createHash("sha256");
  const walk = (p: string) => {
    if (!existsSync(p)) return;
    if (statSync(p).isDirectory()) for (const name of readdirSync(p).sort()) walk(path.join(p, name));
    else h.update(p).update(readFileSync(p));
  };
  for (const p of ["app", "lib", "public", "prisma/schema.prisma", "next.config.js", "package-lock.json", "tsconfig.json"]) walk(p);
  return h.digest("hex");
}

async function main(): Promise<void> {
  const url = databaseUrl();
  migrateDatabase(url);
  const { config } = await import("../lib/config");
  const withDemo = config().CORELAG_DEMO !== "0";
  const { demoWanted, loadDemoIfEmpty } = await import("../lib/services/demo");
  // With the demo data, one demo account per role, printed here once (their passwords are not stored
  // anywhere else); made first, because the demo monitor's device token belongs to the first administrator.
  // Without users and without the demo, the first visit offers "create the administrator".
  const { createDemoAccounts, needsFirstAdmin } = await import("../lib/services/users");
  const accounts = withDemo && (await demoWanted()) ? await createDemoAccounts({ kind: "system", what: "demo" }) : [];
  const demo = withDemo ? await loadDemoIfEmpty() : "skipped";
  console.log(`corelag: database ${url} migrated; demo ${demo === "loaded" ? "loaded" : withDemo ? "already present or not needed" : "off (CORELAG_DEMO=0)"}`);
  if (demo === "loaded") {
    if (accounts.length > 0) {
      console.log("corelag: demo accounts (shown once; give them new passwords (Users page, or corelag user set-password) or disable them before real use):");
      for (const a of accounts) console.log(`  ${a.role.padEnd(9)} ${a.email.padEnd(24)} password: ${a.password}`);
    }
  } else if (await needsFirstAdmin()) {
    console.log("corelag: no accounts yet: open the app to create the administrator, or run `npm run -s corelag -- user add --email E --name N --role admin --password-stdin`");
  }
  // The audit signing key beside the database (created now if there is none), and content hashes for rows
  // recorded before entries carried them (once, after upgrading).
  const { prepareRecords } = await import("../lib/services/verify");
  const records = await prepareRecords();
  console.log(`corelag: audit signing key ${records.fingerprint.slice(0, 16)}… (${records.source})${records.sealed ? `; sealed ${records.sealed} rows recorded before content hashes` : ""}`);
  const stamp = sourceStamp();
  const stampFile = path.join(".next", "corelag-source-stamp");
  const built = existsSync(path.join(".next", "BUILD_ID")) && existsSync(stampFile) && readFileSync(stampFile, "utf8") === stamp;
  if (!built) {
    console.log("corelag: no build of this source yet, running next build (about 30 s)…");
    const res = spawnSync(process.execPath, [path.join("node_modules", "next", "dist", "bin", "next"), "build"], { stdio: "inherit", env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" } });
    if (res.status !== 0) process.exit(res.status ?? 1);
    writeFileSync(stampFile, stamp);
  }
}

main().then(
  () => process.exit(0),
  (e: unknown) => {
    console.error(e instanceof Error ? e.message : e);
    process.exit(1);
  },
);
