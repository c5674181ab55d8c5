import { describe, it, expect } from "vitest";
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { utf16 } from "../helpers/encode";

// The bundled CLI (tests/globalSetup.ts builds it) on bad input (issues #9 and #10): exit 2 with one
// line naming the file, flag or field; never a stack trace, never exit 3.
const ROOT = path.resolve(__dirname, "../..");
const tmp = mkdtempSync(path.join(tmpdir(), "corelag-clibad-"));

function corelag(args: string[], env: Record<string, string> = {}) {
  const r = spawnSync(process.execPath, [path.join(ROOT, "dist/cli/corelag.mjs"), ...args], { cwd: ROOT, encoding: "utf8", env: { ...process.env, ...env } });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

const GAPS = path.join(ROOT, "tests/fixtures/traces/good/16-sentinel-and-gaps.csv");

describe("corelag import: flags", () => {
  it("accepts `--missing -999,9999` as documented (a value that begins with '-')", () => {
    // Before: "argument is ambiguous"; only --missing=-999,9999 worked. Row 3 holds -999.
    for (const args of [["--missing", "-999,9999"], ["--missing=-999,9999"]]) {
      const r = corelag(["import", GAPS, ...args]);
      expect(r.stderr).toBe("");
      expect(r.code).toBe(0);
      expect(JSON.parse(r.stdout).settings.missing).toEqual(["-999", "9999"]);
    }
  });

  it("accepts negative numbers for --plausible-min and says directly when the minimum is above the maximum", () => {
    const ok = corelag(["import", GAPS, "--missing", "-999", "--plausible-min", "-5", "--plausible-max", "30"]);
    expect(ok.code).toBe(0);
    expect(JSON.parse(ok.stdout).settings).toMatchObject({ plausibleMin_C: -5, plausibleMax_C: 30 });
    const r = corelag(["import", GAPS, "--plausible-min", "10", "--plausible-max", "-5"]);
    expect(r.code).toBe(2);
    // Before: "fewer than two valid air readings remain after import"
    expect(r.stderr).toBe("corelag import: --plausible-min: the plausible minimum (10 °C) must be below the plausible maximum (-5 °C)\n");
  });

  it("exits 2 naming the file for UTF-16 of odd length (before: exit 3, naming neither file nor fault)", () => {
    const file = path.join(tmp, "odd16.csv");
    // BOM + "Time,Air\n" (9 characters) + one stray byte: 2 + 18 + 1 = 21 bytes
    writeFileSync(file, new Uint8Array([...utf16("Time,Air\n", false), 0x41]));
    const r = corelag(["import", file]);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(`corelag import: ${file}: the file starts with a UTF-16LE byte-order mark but is not valid UTF-16LE: it has an odd number of bytes (21), so its last character is cut in half; the file may be cut short or damaged\n`);
  });
});

describe("corelag verify: database path", () => {
  it("refuses a database that does not exist in one line, and creates no file", () => {
    const typo = path.join(tmp, "corelag-typo.db");
    const r = corelag(["verify"], { DATABASE_URL: `file:${typo}` });
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toBe(`corelag verify: DATABASE_URL: there is no database at ${typo}; check the path (verify never creates one)\n`);
    expect(existsSync(typo)).toBe(false);
  });

  it("refuses a database in a folder that does not exist, and an empty file", () => {
    const r = corelag(["verify"], { DATABASE_URL: `file:${path.join(tmp, "no-such-folder", "x.db")}` });
    expect(r.code).toBe(2);
    expect(r.stderr.split("\n").length).toBe(2); // one line and the final newline
    const empty = path.join(tmp, "empty.db");
    writeFileSync(empty, "");
    const e = corelag(["verify"], { DATABASE_URL: `file:${empty}` });
    expect(e.code).toBe(2);
    expect(e.stderr).toBe(`corelag verify: DATABASE_URL: ${empty} is not a Corelag database (an empty file)\n`);
  });
});
