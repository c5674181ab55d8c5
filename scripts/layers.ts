// The layers of the code base and the imports each may make. Every import form counts: `import … from`,
// `export … from`, a bare `import "x"`, a dynamic `import("x")` and `require("x")`, so that a lazy import
// cannot slip a framework or the database into the engine.
//
//   app/ → lib/services → lib/db → engine          (lib/cli sits beside app/: services and engine)
//   lib/config (environment and .env, validated) is read by db, services and cli
//   engine, lowest first: trace < thermal < exposure < uncertainty < review < design < shipment, and live (monitors) beside design; consequence (growth and
//   shelf-life models on a temperature history, and their schemas) imports no other lib folder and sits below
//   thermal, whose product schema carries its models; display (charts, times and
//   numbers as shown) and access (roles, permissions, actors) stand alone and import no other lib folder;
//   api (the HTTP API's schemas, problem details, OpenAPI document, token format) sits above the whole engine
//   new lib/ folders must be given a place here before they are used
import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";

/** Engine folders, each with the engine folders it may import (only lower ones). */
export const ENGINE_LAYERS: Record<string, string[]> = {
  trace: [],
  consequence: [],
  thermal: ["trace", "consequence"],
  exposure: ["trace", "thermal", "consequence"],
  uncertainty: ["trace", "thermal", "exposure", "consequence"],
  review: ["trace", "thermal", "exposure", "uncertainty", "consequence"],
  display: [],
  access: [],
  design: ["trace", "thermal", "exposure", "uncertainty", "review", "consequence"],
  live: ["trace", "thermal", "exposure", "uncertainty", "review", "consequence"],
  shipment: ["trace", "thermal", "exposure", "uncertainty", "review", "design", "consequence"],
  // the HTTP API's pure parts: problem details, request/response schemas, the OpenAPI document, tokens
  api: ["trace", "thermal", "exposure", "uncertainty", "review", "design", "access", "consequence", "live", "shipment"],
};
const ENGINE = Object.keys(ENGINE_LAYERS);

/** Orchestration and storage folders under lib/, with what each may import besides the engine. */
const OUTER_LAYERS: Record<string, string[]> = {
  config: [],
  db: ["config"],
  services: ["db", "config"],
  cli: ["services", "config"],
};
/** Top-level files in lib/ shared by every layer (framework-free helpers: form state, zod quantities with ranges). */
const SHARED_FILES = new Set(["validation", "quantity"]);

const FRAMEWORK = /^(next(\/.*)?|react(-dom)?(\/.*)?|server-only|@prisma\/.*|.*generated\/prisma.*|better-sqlite3|pg|@libsql\/.*)$/;
const STORAGE_DRIVER = /^(@prisma\/.*|.*generated\/prisma.*|better-sqlite3|pg|pg-boss|@libsql\/.*)$/;

const SPECIFIER = [
  /\b(?:import|export)\s[^'"`;]*?\bfrom\s*["']([^"']+)["']/g,
  /\bimport\s*["']([^"']+)["']/g,
  /\bimport\s*\(\s*["'`]([^"'`]+)["'`]\s*\)/g,
  /\brequire\s*\(\s*["'`]([^"'`]+)["'`]\s*\)/g,
];

/** Every module specifier a source file names, in any import form. */
export function specifiers(source: string): string[] {
  const out: string[] = [];
  for (const re of SPECIFIER) for (const m of source.matchAll(re)) out.push(m[1]!);
  return out;
}

function sourceFiles(root: string, dir: string): string[] {
  const abs = path.join(root, dir);
  if (!existsSync(abs)) return [];
  return readdirSync(abs).flatMap((name) => {
    const rel = path.join(dir, name);
    if (statSync(path.join(root, rel)).isDirectory()) return sourceFiles(root, rel);
    return /\.(ts|tsx|mts|cts|js|mjs)$/.test(name) ? [rel] : [];
  });
}

/** The lib/ folder (or shared lib file) a specifier points at, or null when it points outside lib/. */
function libTarget(file: string, spec: string): string | null {
  let rel: string;
  if (spec.startsWith("@/")) rel = spec.slice(2);
  else if (spec.startsWith(".")) rel = path.join(path.dirname(file), spec);
  else return null;
  const parts = path.normalize(rel).split(path.sep);
  if (parts[0] === "app") return "app";
  if (parts[0] !== "lib" || parts.length < 2) return null;
  return parts[1]!.replace(/\.(ts|tsx)$/, "");
}

/** All layering problems in the tree at root, one sentence each (empty when clean). */
export function checkLayers(root: string): string[] {
  const problems: string[] = [];
  const libFolders = existsSync(path.join(root, "lib"))
    ? readdirSync(path.join(root, "lib")).filter((n) => statSync(path.join(root, "lib", n)).isDirectory())
    : [];
  for (const folder of libFolders) {
    if (!(folder in ENGINE_LAYERS) && !(folder in OUTER_LAYERS)) {
      problems.push(`lib/${folder}: a new lib/ folder needs a place in scripts/layers.ts (engine or outer layer)`);
    }
  }
  const files = [...sourceFiles(root, "app"), ...sourceFiles(root, "lib")];
  for (const file of files) {
    const parts = file.split(path.sep);
    const layer = parts[0] === "app" ? "app" : parts.length > 2 ? parts[1]! : "shared";
    const specs = specifiers(readFileSync(path.join(root, file), "utf8"));
    for (const spec of specs) {
      if (STORAGE_DRIVER.test(spec) && layer !== "db") {
        problems.push(`${file}: only lib/db may use the storage drivers, but it imports ${spec}`);
        continue;
      }
      const isEngine = ENGINE.includes(layer) || layer === "shared";
      if (isEngine && FRAMEWORK.test(spec)) {
        problems.push(`${file}: the engine must stay framework-free, but it imports ${spec}`);
        continue;
      }
      const target = libTarget(file, spec);
      if (target === null || target === layer || SHARED_FILES.has(target)) continue;
      if (target === "app" && layer !== "app") {
        problems.push(`${file}: lib/ must not import app/ (${spec})`);
      } else if (isEngine && !ENGINE.includes(target)) {
        problems.push(`${file}: the engine must not import lib/${target} (${spec})`);
      } else if (ENGINE.includes(layer) && !ENGINE_LAYERS[layer]!.includes(target)) {
        problems.push(`${file}: lib/${layer} may not import the higher layer lib/${target} (${spec})`);
      } else if (layer in OUTER_LAYERS && !ENGINE.includes(target) && !OUTER_LAYERS[layer]!.includes(target)) {
        problems.push(`${file}: lib/${layer} may not import lib/${target} (${spec})`);
      }
    }
    if (layer !== "db" && /\bnew\s+PrismaClient\b/.test(readFileSync(path.join(root, file), "utf8"))) {
      problems.push(`${file}: only lib/db may construct the Prisma client`);
    }
  }
  return problems;
}
