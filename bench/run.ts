// Speed figures for the engine (`npm run bench`). Not a test: prints numbers with their accuracy.
import { performance } from "node:perf_hooks";
import { lumpedResponse } from "../lib/thermal/lumped";
import { timeBeyond } from "../lib/exposure/timeAbove";

function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function best<T>(runs: number, fn: () => T): { ms: number; value: T } {
  let ms = Infinity;
  let value!: T;
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    value = fn();
    ms = Math.min(ms, performance.now() - t0);
  }
  return { ms, value };
}

function benchLumped(): void {
  const n = 1_000_000;
  const rand = mulberry32(7);
  const t = new Float64Array(n);
  for (let i = 1; i < n; i++) t[i] = t[i - 1]! + 30 + rand() * 570; // irregular, 30 s to 10 min
  const tau = 5400;
  const a0 = 2, s = 1e-5; // slow ramp: the analytical ramp response is the check
  const air = Float64Array.from(t, (ti) => a0 + s * ti);
  const { ms, value } = best(5, () => lumpedResponse(t, air, 4, tau));
  let maxErr = 0;
  for (let i = 0; i < n; i++) {
    const exact = a0 + s * (t[i]! - tau) + (4 - a0 + s * tau) * Math.exp(-t[i]! / tau);
    maxErr = Math.max(maxErr, Math.abs(value[i]! - exact));
  }
  const rate = n / (ms / 1000);
  console.log(
    `lumped exact update: ${n.toLocaleString("en")} irregular samples in ${ms.toFixed(1)} ms = ${(rate / 1e6).toFixed(1)} M samples/s (target ≥ 20); max error vs analytical ramp ${maxErr.toExponential(2)} K`,
  );
}

function benchTimeBeyond(): void {
  const n = 1_000_000;
  const t = Float64Array.from({ length: n }, (_, i) => i * 60);
  const v = Float64Array.from(t, (ti) => 5 + 3 * Math.sin(ti / 3600));
  const { ms, value } = best(5, () => timeBeyond(t, v, 5));
  // sin > 0 for half of every period: expected fraction 1/2 of the span (to within one partial period)
  const frac = value.cumulative_s / (t[n - 1]! - t[0]!);
  console.log(`time beyond threshold: ${n.toLocaleString("en")} samples in ${ms.toFixed(1)} ms; fraction above ${frac.toFixed(5)} (analytical 0.5 over whole periods)`);
}

benchLumped();
benchTimeBeyond();
