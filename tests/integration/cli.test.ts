import { describe, it, expect } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";

const ROOT = path.resolve(__dirname, "../..");
const DEMO = path.join(ROOT, "public/demo");
const tmp = mkdtempSync(path.join(tmpdir(), "corelag-cli-"));

function corelag(...args: string[]) {
  const r = spawnSync(process.execPath, [path.join(ROOT, "node_modules/tsx/dist/cli.mjs"), path.join(ROOT, "lib/cli/main.ts"), ...args], {
    cwd: ROOT,
    encoding: "utf8",
  });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe("corelag review (CLI)", () => {
  it("prints the review as JSON and exits 0", () => {
    const r = corelag("review", "--trace", path.join(DEMO, "route7-tote3.csv"), "--product", path.join(DEMO, "ready-meal.product.json"), "--limits", path.join(DEMO, "ready-meal.limits.json"), "--format", "json");
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.screening.tau_s).toBeCloseTo((0.45 * 3600) / (2.5 * 0.062), 9);
    expect(out.rules[0]).toMatchObject({ id: "core-above-5C", channel: "core", status: "fail" });
    expect(typeof out.rules[0].cumulative_min).toBe("number");
    expect(out.outcome).toBe("reject");
    expect(out.cautions.length).toBeGreaterThan(0);
  });

  it("exits non-zero with one line naming the file and field at fault", () => {
    const bad = path.join(tmp, "bad.product.json");
    writeFileSync(bad, JSON.stringify({ name: "x", mass_kg: 1, properties: { cp_J_kgK: -5 }, area_m2: 0.1, h_W_m2K: 5, initial_C: 3 }));
    const r = corelag("review", "--trace", path.join(DEMO, "route7-tote3.csv"), "--product", bad, "--limits", path.join(DEMO, "ready-meal.limits.json"));
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toBe(`corelag review: ${bad}: field 'properties.cp_J_kgK': specific heat must be greater than zero\n`);
  });

  it("names the row and column of a bad trace cell", () => {
    const trace = path.join(tmp, "bad.csv");
    writeFileSync(trace, "Time,Air\n2026-01-01T00:00:00Z,3.1\n2026-01-01T00:01:00Z,3,2\n");
    const r = corelag("review", "--trace", trace, "--product", path.join(DEMO, "ready-meal.product.json"), "--limits", path.join(DEMO, "ready-meal.limits.json"));
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(`corelag review: ${trace}: row 3: expected 2 fields but found 3\n`);
  });

  it("refuses an unknown time zone flag", () => {
    const r = corelag("review", "--trace", "x.csv", "--product", "p.json", "--limits", "l.json", "--tz", "Mars/Olympus");
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--tz: is not a known IANA time zone/);
  });
});
