// Whole-process figures for the bundled command line (`npm run bench`): start-up, predict on 200,000
// irregular samples beside a numpy + scipy script doing the same job, and import of 1,000,000 rows.
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { performance } from "node:perf_hooks";
import Papa from "papaparse";
import { mulberry32 } from "../lib/uncertainty/random";
import { makeLoggerCsv } from "./import";

const ROOT = path.resolve(__dirname, "..");
const CLI = path.join(ROOT, "dist", "cli", "corelag.mjs");

function timed(cmd: string, args: string[]): { s: number; code: number | null; stderr: string } {
  const t0 = performance.now();
  const r = spawnSync(cmd, args, { cwd: ROOT, encoding: "utf8", maxBuffer: 1 << 30 });
  return { s: (performance.now() - t0) / 1000, code: r.status, stderr: r.stderr };
}
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

function benchStartup(): void {
  const node = median(Array.from({ length: 7 }, () => timed(process.execPath, ["-e", "0"]).s));
  const version = median(Array.from({ length: 7 }, () => timed(process.execPath, [CLI, "--version"]).s));
  console.log(`cli start-up: corelag --version ${(version * 1000).toFixed(0)} ms median of 7 (target < 250); node -e 0 ${(node * 1000).toFixed(0)} ms`);
}

function benchPredict(dir: string): void {
  // 200,000 samples 30 s to 10 min apart of a logger-like air: a daily swing, door-opening steps and
  // noise (invented). The reference is the exact response of C·dT/dt = (T_air − T)/R to air that is linear
  // between samples, worked here interval by interval from the closed form (Incropera §5.3), not by the engine.
  const n = 200_000, t0_C = 4;
  const product = { name: "bench body", mass_kg: 2, properties: { cp_J_kgK: 3600 }, area_m2: 0.1, h_W_m2K: 10, initial_C: t0_C };
  const tau = (product.mass_kg * product.properties.cp_J_kgK) / (product.h_W_m2K * product.area_m2); // 7200 s
  const rand = mulberry32(11);
  const start = Date.UTC(2026, 0, 1) / 1000;
  const t = new Float64Array(n), air = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    if (i) t[i] = t[i - 1]! + Math.round(30 + rand() * 570);
    const door = rand() < 0.01 ? 6 : 0;
    air[i] = Number((5 + 3 * Math.sin((2 * Math.PI * t[i]!) / 86_400) + door + (rand() - 0.5)).toFixed(2));
  }
  let csv = "time,air_C\n";
  for (let i = 0; i < n; i++) csv += `${new Date((start + t[i]!) * 1000).toISOString()},${air[i]!.toFixed(2)}\n`;
  const exact = new Float64Array(n);
  exact[0] = t0_C;
  for (let i = 1; i < n; i++) {
    const h = t[i]! - t[i - 1]!, slope = (air[i]! - air[i - 1]!) / h, e = Math.exp(-h / tau);
    // T(h) = a1 − slope·tau + (T0 − a0 + slope·tau)·e^(−h/tau), with a0, a1 the air at the ends
    exact[i] = air[i]! - slope * tau + (exact[i - 1]! - air[i - 1]! + slope * tau) * e;
  }
  const trace = path.join(dir, "trace.csv"), productFile = path.join(dir, "p.json"), out = path.join(dir, "out.csv");
  writeFileSync(trace, csv);
  writeFileSync(productFile, JSON.stringify(product));
  const runs = Array.from({ length: 3 }, () => timed(process.execPath, [CLI, "predict", "--trace", trace, "--product", productFile, "--model", "lumped", "--out", out]));
  if (runs.some((r) => r.code !== 0)) throw new Error(`predict failed: ${runs[0]!.stderr}`);
  const ours = Math.min(...runs.map((r) => r.s));
  const rows = readFileSync(out, "utf8").trim().split("\r\n").slice(1);
  let maxErr = 0;
  rows.forEach((row, i) => (maxErr = Math.max(maxErr, Math.abs(Number(row.split(",")[2]) - exact[i]!))));
  let line = `cli predict --model lumped --out: ${n.toLocaleString("en")} irregular samples in ${ours.toFixed(2)} s (whole process, best of 3); max error vs the exact piecewise-linear response ${maxErr.toExponential(2)} K (target < 1e-3)`;
  const hasScipy = spawnSync("python3", ["-c", "import numpy, scipy"]).status === 0;
  if (hasScipy) {
    const py = Array.from({ length: 1 }, () => timed("python3", [path.join(ROOT, "bench", "predict_scipy.py"), trace, path.join(dir, "py.csv"), String(tau), String(t0_C)]));
    if (py.some((r) => r.code !== 0)) throw new Error(`numpy + scipy script failed: ${py[0]!.stderr}`);
    const theirs = Math.min(...py.map((r) => r.s));
    line += `; numpy + scipy solve_ivp RK45 script ${theirs.toFixed(2)} s (one run), Corelag ${(theirs / ours).toFixed(1)}× faster (target ≥ 10×)`;
  } else {
    line += "; python3 with numpy and scipy is not installed here, so the side-by-side script was not run";
  }
  console.log(line);
}

function benchImportProcess(dir: string): void {
  const bytes = makeLoggerCsv(1_000_000);
  const file = path.join(dir, "million.csv");
  writeFileSync(file, bytes);
  const runs = Array.from({ length: 3 }, () => timed(process.execPath, [CLI, "import", file]));
  if (runs.some((r) => r.code !== 0)) throw new Error(`import failed: ${runs[0]!.stderr}`);
  const ours = Math.min(...runs.map((r) => r.s));
  let bare = Infinity;
  for (let i = 0; i < 3; i++) {
    const t0 = performance.now();
    Papa.parse<string[]>(new TextDecoder().decode(readFileSync(file)), { delimiter: "," });
    bare = Math.min(bare, (performance.now() - t0) / 1000);
  }
  console.log(`cli import: 1,000,000 rows (${(bytes.length / 1e6).toFixed(0)} MB) in ${ours.toFixed(2)} s whole process (target < 1.5 s); read + decode + bare Papa.parse ${bare.toFixed(2)} s in-process, ratio ${(ours / bare).toFixed(2)} (target ≤ 1.5)`);
}

export function benchCli(): void {
  const dir = mkdtempSync(path.join(tmpdir(), "corelag-bench-cli-"));
  try {
    benchStartup();
    benchPredict(dir);
    benchImportProcess(dir);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
