import { describe, it, expect } from "vitest";
import { readFileSync } from "node:fs";
import path from "node:path";

// The quick start is what a new user reads first: it must state what the machine needs and how to start over.
const ROOT = path.resolve(__dirname, "../..");
const readme = readFileSync(path.join(ROOT, "README.md"), "utf8");
const quickStart = readme.slice(readme.indexOf("## Quick start"), readme.indexOf("## Using it"));
const scripts = (JSON.parse(readFileSync(path.join(ROOT, "package.json"), "utf8")) as { scripts: Record<string, string> }).scripts;

describe("README quick start", () => {
  it("names Node.js 20 and the build tools with their Debian packages before the first command", () => {
    const firstCommand = quickStart.indexOf("```sh");
    const prerequisites = quickStart.slice(0, firstCommand);
    expect(prerequisites).toContain("Node.js 20");
    expect(prerequisites).toMatch(/python3, make and a C\+\+ compiler/);
    expect(prerequisites).toContain("apt-get install python3 make g++");
  });

  it("says how long a first start takes, how to reset the demo database (with a script that exists) and that npm test builds", () => {
    expect(quickStart).toMatch(/first `npm start` \d+ min/);
    expect(quickStart).toContain("npm run demo:reset -- --yes");
    expect(scripts["demo:reset"]).toBe("tsx scripts/reset-demo.ts");
    expect(quickStart).toContain("`npm test` builds the app");
    expect(scripts.test).toMatch(/ensure-build/);
  });
});
