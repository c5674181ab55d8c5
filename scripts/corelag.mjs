// `npm run -s corelag -- …`: runs the bundled command line, rebuilding it first when any source file is
// newer than the bundle (as `npm start` does for the app).
import { existsSync, readdirSync, statSync } from "node:fs";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const BUNDLE = path.join(ROOT, "dist", "cli", "corelag.mjs");

function newestSource(dir) {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, entry.name);
    if (entry.isDirectory()) newest = Math.max(newest, newestSource(p));
    else if (/\.(ts|tsx|json)$/.test(entry.name)) newest = Math.max(newest, statSync(p).mtimeMs);
  }
  return newest;
}

const built = existsSync(BUNDLE) ? statSync(BUNDLE).mtimeMs : 0;
const sources = Math.max(newestSource(path.join(ROOT, "lib")), statSync(path.join(ROOT, "package.json")).mtimeMs, existsSync(path.join(ROOT, "generated")) ? newestSource(path.join(ROOT, "generated")) : 0);
if (sources > built) {
  const { buildCli } = await import("./build-cli.mjs");
  await buildCli();
}
await import(pathToFileURL(BUNDLE).href);
