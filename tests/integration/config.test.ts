import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { mergedEnv, parseConfig } from "@/lib/config";
import { startServer } from "../helpers/server";
import { seedAccounts, signInCookie } from "../helpers/accounts";

const ROOT = path.resolve(__dirname, "..", "..");
const dir = mkdtempSync(path.join(tmpdir(), "corelag-env-"));
const dbFile = path.join(dir, "from-dotenv.db");
const envFile = path.join(dir, ".env");
writeFileSync(envFile, `# a team's settings\nDATABASE_URL=file:${dbFile}\n`);

/** The environment of a process started by someone who set only CORELAG_ENV_FILE: no DATABASE_URL. */
function envWithOnlyTheFile(): NodeJS.ProcessEnv {
  const env: Record<string, string> = {};
  for (const [k, v] of Object.entries(process.env)) if (v !== undefined && k !== "DATABASE_URL") env[k] = v;
  env.CORELAG_ENV_FILE = envFile;
  return env as NodeJS.ProcessEnv;
}

afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("configuration", () => {
  it("mergedEnv lets the environment win over the .env file, and parseConfig names the variable at fault", () => {
    expect(mergedEnv({ CORELAG_ENV_FILE: envFile }).DATABASE_URL).toBe(`file:${dbFile}`);
    expect(mergedEnv({ CORELAG_ENV_FILE: envFile, DATABASE_URL: "file:other.db" }).DATABASE_URL).toBe("file:other.db");
    expect(() => parseConfig({ DATABASE_URL: "mysql://x" })).toThrow("invalid configuration: DATABASE_URL: DATABASE_URL must be a SQLite file: URL");
    expect(() => mergedEnv({ CORELAG_ENV_FILE: path.join(dir, "missing.env") })).toThrow("does not exist");
  });

  it("with DATABASE_URL only in .env, migrations, the CLI and the server all use that one file", async () => {
    const env = envWithOnlyTheFile();
    // 1. Migrations (the Prisma CLI reads prisma.config.ts, which reads lib/config).
    const migrate = spawnSync(process.execPath, [path.join(ROOT, "node_modules", "prisma", "build", "index.js"), "migrate", "deploy"], { cwd: ROOT, env, encoding: "utf8" });
    expect(migrate.status, migrate.stderr).toBe(0);
    expect(existsSync(dbFile)).toBe(true);

    // 2. A trace stored through the service layer of a process configured the same way.
    const store = spawnSync(
      process.execPath,
      [path.join(ROOT, "node_modules", "tsx", "dist", "cli.mjs"), "-e",
        `import { importAndStoreTrace } from "./lib/services/traces";
         const csv = new TextEncoder().encode("time,air_C\\n2026-06-16T00:00:00Z,4\\n2026-06-16T00:10:00Z,5\\n2026-06-16T00:20:00Z,6\\n");
         importAndStoreTrace(csv, { fileName: "dotenv-probe.csv", name: "Trace kept in the .env database", options: {} }, { kind: "system", what: "test" })
           .then((r) => { console.log(JSON.stringify(r)); process.exit(r.ok ? 0 : 1); });`],
      { cwd: ROOT, env, encoding: "utf8" },
    );
    expect(store.status, store.stderr).toBe(0);

    // 3. The CLI's verify sees that database's chain: the signing key's entry, then the import.
    const verify = spawnSync(process.execPath, [path.join(ROOT, "dist", "cli", "corelag.mjs"), "verify"], { cwd: ROOT, env, encoding: "utf8" });
    expect(verify.status, verify.stderr).toBe(0);
    expect(JSON.parse(verify.stdout).chain.entries).toBe(2);

    // 4. The server lists it.
    seedAccounts(`file:${dbFile}`);
    const server = await startServer({ ...env, DATABASE_URL: undefined });
    try {
      const page = await (await fetch(server.url + "/traces", { headers: { cookie: await signInCookie(server.url, "auditor") } })).text();
      expect(page).toContain("Trace kept in the .env database");
    } finally {
      await server.stop();
    }
    // Nothing was created in the default location by any of them.
    expect(readFileSync(envFile, "utf8")).toContain(dbFile);
  });
});
