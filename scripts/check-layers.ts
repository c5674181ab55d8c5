// The layering rule, enforced: the engine (lib/trace, lib/thermal, lib/exposure, lib/review) is
// framework-free; only lib/db touches the Prisma client; app/ never imports the Prisma client directly.
import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";

const ROOT = path.resolve(__dirname, "..");
const ENGINE = ["lib/trace", "lib/thermal", "lib/exposure", "lib/review", "lib/design"];
const FRAMEWORK = /from\s+["'](next(\/[^"']*)?|react(-dom)?(\/[^"']*)?|@prisma\/[^"']+|[./]*generated\/prisma[^"']*|server-only)["']/;
const PRISMA = /from\s+["']([./@]*generated\/prisma[^"']*|@prisma\/client[^"']*)["']|new PrismaClient/;

function files(dir: string): string[] {
  const abs = path.join(ROOT, dir);
  return readdirSync(abs).flatMap((name) => {
    const p = path.join(abs, name);
    if (statSync(p).isDirectory()) return files(path.join(dir, name));
    return /\.(ts|tsx)$/.test(name) ? [path.join(dir, name)] : [];
  });
}

const problems: string[] = [];
for (const dir of ENGINE) {
  for (const f of files(dir)) {
    const text = readFileSync(path.join(ROOT, f), "utf8");
    const m = text.match(FRAMEWORK);
    if (m) problems.push(`${f}: the engine must stay framework-free, but it imports ${m[1]}`);
    if (/from\s+["'][./]*\.\.\/db\b/.test(text)) problems.push(`${f}: the engine must not import storage (lib/db)`);
  }
}
for (const f of [...files("app"), ...files("lib")].filter((f) => !f.startsWith("lib/db/"))) {
  if (PRISMA.test(readFileSync(path.join(ROOT, f), "utf8"))) problems.push(`${f}: only lib/db may use the Prisma client`);
}
if (problems.length) {
  console.error(problems.join("\n"));
  process.exit(1);
}
console.log(`layers: ok (${ENGINE.join(", ")} framework-free; Prisma only in lib/db)`);
