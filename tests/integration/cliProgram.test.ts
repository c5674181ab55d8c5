import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";

// The bundled command line (built by tests/globalSetup.ts, as postinstall builds it), run as a whole process.
const ROOT = path.resolve(__dirname, "../..");
const BUNDLE = path.join(ROOT, "dist", "cli", "corelag.mjs");
const DEMO = path.join(ROOT, "public", "demo");
const TRACE = path.join(DEMO, "route7-tote3.csv");
const PRODUCT = path.join(DEMO, "ready-meal.product.json");
const tmp = mkdtempSync(path.join(tmpdir(), "corelag-cliprog-"));

function corelag(args: string[], opts: { input?: string | Buffer; nodeArgs?: string[] } = {}) {
  const r = spawnSync(process.execPath, [...(opts.nodeArgs ?? []), BUNDLE, ...args], { cwd: ROOT, input: opts.input, encoding: "utf8", maxBuffer: 64 << 20 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe("corelag as a program", () => {
  it("--version prints the program and engine versions and exits 0", () => {
    const pkg = JSON.parse(readFileSync(path.join(ROOT, "package.json"), "utf8")) as { version: string };
    const engine = /export const ENGINE_VERSION = "([^"]+)"/.exec(readFileSync(path.join(ROOT, "lib/review/runReview.ts"), "utf8"))![1];
    const r = corelag(["--version"]);
    expect(r).toEqual({ code: 0, stdout: `corelag ${pkg.version} (engine ${engine})\n`, stderr: "" });
  });

  it("--help lists every command on stdout and exits 0; a command's --help shows its options", () => {
    const r = corelag(["--help"]);
    expect(r.code).toBe(0);
    for (const c of ["import", "predict", "review", "calibrate", "size", "verify", "anchor", "key", "seal"]) expect(r.stdout).toMatch(new RegExp(`^  ${c} `, "m"));
    expect(r.stdout).toContain("3 unexpected failure");
    const review = corelag(["review", "--help"]);
    expect(review.code).toBe(0);
    expect(review.stdout).toMatch(/^corelag review --trace FILE --product P\.json/);
    expect(review.stdout).toContain("--missing CODE,CODE");
    expect(review.stderr).toBe("");
  });

  it("reads a trace from standard input with -", () => {
    const fromFile = corelag(["import", TRACE]);
    const fromStdin = corelag(["import", "-"], { input: readFileSync(TRACE) });
    expect(fromStdin.code).toBe(0);
    expect(JSON.parse(fromStdin.stdout)).toEqual(JSON.parse(fromFile.stdout));
    expect(JSON.parse(fromStdin.stdout).samples).toBe(361);
  });

  it("predict --out - writes the CSV, and only the CSV, to standard output; --out FILE writes the same bytes", () => {
    const r = corelag(["predict", "--trace", TRACE, "--product", PRODUCT, "--model", "lumped", "--out", "-"]);
    expect(r.code).toBe(0);
    const lines = r.stdout.split("\r\n");
    expect(lines[0]).toBe("time_utc,air_C,core_C,surface_C,mean_C");
    expect(lines).toHaveLength(361 + 2); // header, 361 rows, and the empty string after the last CRLF
    const file = path.join(tmp, "out.csv");
    const f = corelag(["predict", "--trace", TRACE, "--product", PRODUCT, "--model", "lumped", "--out", file]);
    expect(f.code).toBe(0);
    expect(JSON.parse(f.stdout).out).toBe(file);
    expect(readFileSync(file, "utf8")).toBe(r.stdout);
  });

  it("bad input exits 2 with one line naming the file; an unknown command exits 2", () => {
    const missing = path.join(tmp, "no-such.json");
    const r = corelag(["predict", "--trace", TRACE, "--product", missing]);
    expect(r).toEqual({ code: 2, stdout: "", stderr: `corelag predict: ${missing}: cannot be read (ENOENT)\n` });
    expect(corelag(["frobnicate"]).code).toBe(2);
  });

  it("an unexpected failure exits 3 with one line, and --debug adds the stack", () => {
    // A real fault inside the command (not bad input): the clock's formatter fails under a preloaded patch.
    const preload = path.join(tmp, "break-iso.cjs");
    writeFileSync(preload, `Date.prototype.toISOString = function () { throw new Error("formatter exploded"); };\n`);
    const r = corelag(["import", TRACE], { nodeArgs: ["--require", preload] });
    expect(r.code).toBe(3);
    expect(r.stderr).toBe("corelag import: unexpected failure: formatter exploded (rerun with --debug for the stack trace)\n");
    const d = corelag(["import", TRACE, "--debug"], { nodeArgs: ["--require", preload] });
    expect(d.code).toBe(3);
    expect(d.stderr.split("\n").length).toBeGreaterThan(3);
    expect(d.stderr).toContain("at ");
  });
});
