import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterEach, describe, expect, test } from "vitest";
import { checkLayers, specifiers } from "@/scripts/layers";

let root = "";
function tree(files: Record<string, string>): string {
  root = mkdtempSync(path.join(tmpdir(), "layers-"));
  for (const [name, text] of Object.entries(files)) {
    mkdirSync(path.dirname(path.join(root, name)), { recursive: true });
    writeFileSync(path.join(root, name), text);
  }
  return root;
}
afterEach(() => rmSync(root, { recursive: true, force: true }));

describe("specifiers", () => {
  test("finds static, re-export, side-effect, dynamic and require forms", () => {
    const src = [
      `import { a } from "./a";`,
      `import type { B } from '../b';`,
      `export * from "./c";`,
      `import "server-only";`,
      `const d = await import("../db/audit");`,
      `const e = require("better-sqlite3");`,
      `import {\n  f,\n  g,\n} from "@/lib/thermal/f";`,
    ].join("\n");
    expect(specifiers(src).sort()).toEqual(["../b", "../db/audit", "./a", "./c", "@/lib/thermal/f", "better-sqlite3", "server-only"].sort());
  });
});

describe("checkLayers", () => {
  test("a clean tree has no problems", () => {
    tree({
      "lib/thermal/a.ts": `import { x } from "../trace/x";`,
      "lib/trace/x.ts": `export const x = 1;`,
      "lib/db/client.ts": `import { PrismaClient } from "../../generated/prisma/client"; new PrismaClient();`,
      "lib/services/s.ts": `import { x } from "../db/client"; import { y } from "../review/y";`,
      "lib/review/y.ts": `import { m } from "../uncertainty/m";`,
      "lib/uncertainty/m.ts": `export const m = 1;`,
      "lib/cli/main.ts": `const v = await import("../services/s");`,
      "app/page.tsx": `import { x } from "@/lib/db/client"; import React from "react";`,
    });
    expect(checkLayers(root)).toEqual([]);
  });

  test("a dynamic import of storage from the engine is caught", () => {
    tree({ "lib/thermal/a.ts": `export async function f() { return import("../db/client"); }`, "lib/db/client.ts": `` });
    expect(checkLayers(root)).toEqual(["lib/thermal/a.ts: the engine must not import lib/db (../db/client)"]);
  });

  test("an upward import inside the engine is caught (review → design)", () => {
    tree({ "lib/review/r.ts": `import { monteCarlo } from "../design/uncertainty";`, "lib/design/uncertainty.ts": `` });
    expect(checkLayers(root)).toEqual(["lib/review/r.ts: lib/review may not import the higher layer lib/design (../design/uncertainty)"]);
  });

  test("a storage driver outside lib/db is caught, whether imported or required", () => {
    tree({
      "app/api/x/route.ts": `import Database from "better-sqlite3";`,
      "lib/services/s.ts": `const pg = require("pg");`,
    });
    expect(checkLayers(root)).toEqual([
      "app/api/x/route.ts: only lib/db may use the storage drivers, but it imports better-sqlite3",
      "lib/services/s.ts: only lib/db may use the storage drivers, but it imports pg",
    ]);
  });

  test("a framework import in the engine, the CLI reaching into storage, and an unplaced folder are caught", () => {
    tree({
      "lib/exposure/e.ts": `import { cache } from "react";`,
      "lib/cli/main.ts": `import { listAudit } from "../db/audit";`,
      "lib/db/audit.ts": ``,
      "lib/newthing/n.ts": ``,
    });
    expect(checkLayers(root).sort()).toEqual([
      "lib/cli/main.ts: lib/cli may not import lib/db (../db/audit)",
      "lib/exposure/e.ts: the engine must stay framework-free, but it imports react",
      "lib/newthing: a new lib/ folder needs a place in scripts/layers.ts (engine or outer layer)",
    ]);
  });
});
