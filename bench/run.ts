// Speed figures for the engine (`npm run bench`). Not a test: prints numbers with their accuracy.
import { performance } from "node:perf_hooks";
import { lumpedResponse } from "../lib/thermal/lumped";
import { mulberry32 } from "../lib/uncertainty/random";
import { timeBeyond } from "../lib/exposure/timeAbove";
import { predict } from "../lib/thermal/predict";
import type { Product } from "../lib/thermal/definitions";
import { centreTheta } from "../tests/helpers/series";
import { benchImport } from "./import";
import { benchDesign } from "./design";
import { benchCli } from "./cli";
import { benchWeb } from "./web";
import { benchDatabases } from "./databases";
import { benchBox } from "./multiD";
import { benchConsequence } from "./consequence";
import { benchLive } from "./live";
import { benchHistory } from "./history";


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

function benchSphere(): void {
  // 40-shell sphere over 100,000 one-minute samples of a daily cycle with noise. Accuracy is read on a
  // separate step-response run against the exact series (Incropera et al. §5.6).
  const r0 = 0.05, k = 0.5, rho = 1000, cp = 3600, bi = 1;
  const product: Product = { name: "bench sphere", shape: { kind: "sphere", radius_m: r0 }, properties: { density_kg_m3: rho, cp_J_kgK: cp, k_W_mK: k }, initial_C: 4, h_W_m2K: (bi * k) / r0 };
  const n = 100_000;
  const rand = mulberry32(3);
  const t = Float64Array.from({ length: n }, (_, i) => i * 60);
  const air = Float64Array.from(t, (ti) => 6 + 8 * Math.sin((2 * Math.PI * ti) / 86400) + (rand() - 0.5));
  const { ms, value } = best(3, () => predict(product, undefined, t, air, { model: "conduction", shells: 40 }));
  const ts = Float64Array.from({ length: 721 }, (_, i) => i * 60);
  const step = predict({ ...product, initial_C: 20 }, undefined, ts, new Float64Array(ts.length), { model: "conduction", shells: 40 });
  const alpha = k / (rho * cp);
  let err = 0;
  for (const i of [30, 60, 180, 360, 720]) err = Math.max(err, Math.abs(step.core[i]! - 20 * centreTheta("sphere", bi, (alpha * ts[i]!) / r0 ** 2)));
  console.log(
    `1-D sphere, 40 shells: ${n.toLocaleString("en")} samples in ${ms.toFixed(0)} ms (target < 1000), step ${value.solver.step_s} s, halving change ${value.solver.halving_change_K!.toExponential(2)} K; centre error vs series on a 20 K step ${err.toExponential(2)} K`,
  );
}

benchImport();
benchLumped();
benchTimeBeyond();
benchSphere();
benchBox();
benchLive();
benchHistory();
benchDesign();
benchConsequence();
benchCli();
benchWeb()
  .then(() => benchDatabases())
  .catch((e: unknown) => {
    console.error(`web benchmark failed: ${e instanceof Error ? e.message : String(e)}`);
    process.exitCode = 1;
  });
