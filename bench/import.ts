// Import benchmark (`npm run bench` runs it): 1,000,000 rows of a timestamp and two temperature
// columns (about 40 MB), parsed and validated, against the bare CSV parser on the same text.
import { performance } from "node:perf_hooks";
import Papa from "papaparse";
import { importCsv } from "../lib/trace/importCsv";

export function makeLoggerCsv(rows: number): Uint8Array {
  // Written row by row into one buffer, so making the file does not itself raise the memory high-water mark.
  const enc = new TextEncoder();
  const out = new Uint8Array(64 + rows * 48);
  let at = enc.encodeInto("Logger serial: BENCH-1\nTime,Air 1 (°C),Air 2 (°C)\n", out).written;
  const start = Date.UTC(2026, 0, 1);
  for (let i = 0; i < rows; i++) {
    const t = new Date(start + i * 60_000).toISOString();
    const a = (4 + 3 * Math.sin(i / 500)).toFixed(3);
    const b = (4.5 + 3 * Math.sin(i / 480)).toFixed(3);
    at += enc.encodeInto(`${t},${a},${b}\n`, out.subarray(at)).written;
  }
  return out.slice(0, at);
}

export function benchImport(): void {
  const bytes = makeLoggerCsv(1_000_000);
  const mb = bytes.length / 1e6;
  // Peak memory first, before anything else has grown the process: maxRSS is the high-water mark.
  const before = process.resourceUsage().maxRSS * 1024;
  const first = importCsv(bytes);
  const growth = process.resourceUsage().maxRSS * 1024 - before;
  let ours = Infinity;
  for (let i = 0; i < 3; i++) {
    const t0 = performance.now();
    importCsv(bytes);
    ours = Math.min(ours, performance.now() - t0);
  }
  let bare = Infinity;
  for (let i = 0; i < 3; i++) {
    const t0 = performance.now();
    Papa.parse<string[]>(new TextDecoder().decode(bytes), { delimiter: "," });
    bare = Math.min(bare, performance.now() - t0);
  }
  const samples = first.series.t_s.length;
  console.log(
    `import: ${samples.toLocaleString("en")} rows (${mb.toFixed(1)} MB) in ${ours.toFixed(0)} ms = ${(samples / (ours / 1000) / 1e6).toFixed(2)} M rows/s (target < 2000 ms); ` +
      `bare decode + Papa.parse ${bare.toFixed(0)} ms, ratio ${(ours / bare).toFixed(2)} (target ≤ 2); peak memory growth ${(growth / 1e6).toFixed(0)} MB = ${(growth / bytes.length).toFixed(1)}× the file (target < 10×)`,
  );
}
