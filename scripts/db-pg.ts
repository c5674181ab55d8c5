// `npm run db:pg`: writes prisma/postgres/ (schema and migrations) from prisma/schema.prisma and the SQLite
// migrations, then generates the PostgreSQL client. `npm run db:pg -- --check` only reports drift (exit 1).
import { mkdirSync, rmSync, writeFileSync, existsSync, readdirSync } from "node:fs";
import { spawnSync } from "node:child_process";
import path from "node:path";
import { driftOf, generatePostgres, PG_DIR, ROOT } from "./pgSchema";

const check = process.argv.includes("--check");
const files = generatePostgres();
const drift = driftOf(files);
if (check) {
  if (drift.length) {
    console.error(`${drift.join("\n")}\nrun: npm run db:pg`);
    process.exit(1);
  }
  console.log("prisma/postgres: up to date");
  process.exit(0);
}
// Folders without a SQLite counterpart are removed; every generated file is (re)written.
const migrations = path.join(PG_DIR, "migrations");
if (existsSync(migrations)) {
  for (const d of readdirSync(migrations, { withFileTypes: true })) {
    if (d.isDirectory() && !files.has(path.join("migrations", d.name, "migration.sql"))) rmSync(path.join(migrations, d.name), { recursive: true });
  }
}
for (const [rel, content] of files) {
  mkdirSync(path.dirname(path.join(PG_DIR, rel)), { recursive: true });
  writeFileSync(path.join(PG_DIR, rel), content);
}
const gen = spawnSync(process.execPath, [path.join(ROOT, "node_modules", "prisma", "build", "index.js"), "generate", "--config", path.join(PG_DIR, "prisma.config.ts")], { cwd: ROOT, stdio: "inherit", env: { ...process.env, CHECKPOINT_DISABLE: "1", CORELAG_PG_OFFLINE: "1" } });
if (gen.status !== 0) process.exit(gen.status ?? 1);
console.log(`prisma/postgres: ${drift.length ? `updated (${drift.length} file(s))` : "already up to date"}; PostgreSQL client generated`);
