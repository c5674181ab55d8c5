// Bundles ahead of time (esbuild), so that they run with plain node and no TypeScript compiler:
// - the command line: dist/cli/corelag.mjs plus lazily loaded chunks;
// - the engine worker of the server's pool: dist/worker/reviewWorker.mjs (lib/services/enginePool.ts).
// Run by postinstall, by `npm run build`, and by scripts/corelag.mjs whenever the source is newer.
import { build } from "esbuild";
import { readFileSync, rmSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
export const OUT_DIR = path.join(ROOT, "dist", "cli");
const WORKER_DIR = path.join(ROOT, "dist", "worker");

function engineVersion() {
  const text = readFileSync(path.join(ROOT, "lib", "review", "runReview.ts"), "utf8");
  const m = text.match(/export const ENGINE_VERSION = "([^"]+)"/);
  if (!m) throw new Error("build-cli: ENGINE_VERSION not found in lib/review/runReview.ts");
  return m[1];
}

export async function buildCli() {
  const pkg = JSON.parse(readFileSync(path.join(ROOT, "package.json"), "utf8"));
  rmSync(OUT_DIR, { recursive: true, force: true });
  await build({
    entryPoints: { corelag: path.join(ROOT, "lib", "cli", "corelag.ts") },
    outdir: OUT_DIR,
    bundle: true,
    splitting: true,
    format: "esm",
    platform: "node",
    target: "node20",
    outExtension: { ".js": ".mjs" },
    // Native and engine packages stay in node_modules; everything else is bundled.
    external: ["@prisma/*", "better-sqlite3", "pg", "esbuild", "@node-rs/*"],
    // Some bundled CommonJS packages call require(): give the ESM bundle one.
    banner: { js: "import { createRequire as __corelagRequire } from 'node:module'; const require = __corelagRequire(import.meta.url);" },
    define: {
      __CORELAG_VERSION__: JSON.stringify(pkg.version),
      __CORELAG_ENGINE_VERSION__: JSON.stringify(engineVersion()),
    },
    logLevel: "error",
    legalComments: "none",
  });
  rmSync(WORKER_DIR, { recursive: true, force: true });
  await build({
    entryPoints: { reviewWorker: path.join(ROOT, "lib", "services", "workers", "reviewWorker.ts") },
    outdir: WORKER_DIR,
    bundle: true,
    format: "esm",
    platform: "node",
    target: "node20",
    outExtension: { ".js": ".mjs" },
    banner: { js: "import { createRequire as __corelagRequire } from 'node:module'; const require = __corelagRequire(import.meta.url);" },
    logLevel: "error",
    legalComments: "none",
  });
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  buildCli().catch((e) => {
    console.error(e instanceof Error ? e.message : e);
    process.exit(1);
  });
}
