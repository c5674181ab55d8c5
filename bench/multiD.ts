// 3-D box over a 2-day, 1-minute trace (target < 2 s): a constant-property brick and the demo's
// composition-based ready-meal tray in the demo tote (radiation updated every step, coolant node).
import { performance } from "node:perf_hooks";
import { readFileSync } from "node:fs";
import path from "node:path";
import { predict } from "../lib/thermal/predict";
import { packSchema, productSchema, type Product } from "../lib/thermal/definitions";
import { mulberry32 } from "../lib/uncertainty/random";
import { centreTheta } from "../tests/helpers/series";

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

export function benchBox(): void {
  const n = 2 * 1440 + 1;
  const rand = mulberry32(5);
  const t = Float64Array.from({ length: n }, (_, i) => i * 60);
  const air = Float64Array.from(t, (ti) => 6 + 8 * Math.sin((2 * Math.PI * ti) / 86400) + (rand() - 0.5));
  const k = 0.5, rho = 1000, cp = 3600, h = 10;
  const dims: [number, number, number] = [0.2, 0.1, 0.06];
  const brick: Product = { name: "brick", shape: { kind: "box", x_m: dims[0], y_m: dims[1], z_m: dims[2] }, properties: { density_kg_m3: rho, cp_J_kgK: cp, k_W_mK: k }, initial_C: 4, h_W_m2K: h };
  const a = best(2, () => predict(brick, undefined, t, air, { model: "conduction" }));
  // accuracy on a 20 K step against θx·θy·θz (Incropera et al. §5.8)
  const alpha = k / (rho * cp);
  const ts = Float64Array.from({ length: 97 }, (_, i) => i * 300);
  const step = predict({ ...brick, initial_C: 20 }, undefined, ts, new Float64Array(ts.length), { model: "conduction" });
  let err = 0;
  for (let i = 1; i < ts.length; i++) {
    const th = dims.reduce((p, d) => p * centreTheta("slab", (h * d) / 2 / k, (alpha * ts[i]!) / (d / 2) ** 2), 1);
    err = Math.max(err, Math.abs(step.core[i]! - 20 * th));
  }
  console.log(
    `3-D box (${a.value.solver.grid}), constant properties: ${(n - 1).toLocaleString("en")} one-minute intervals in ${a.ms.toFixed(0)} ms (target < 2000), step ${a.value.solver.step_s} s, halving change ${a.value.solver.halving_change_K!.toExponential(2)} K; centre error vs product solution on a 20 K step ${err.toExponential(2)} K`,
  );
  const demo = path.join(__dirname, "..", "public", "demo");
  const tray = productSchema.parse(JSON.parse(readFileSync(path.join(demo, "ready-meal-shaped.product.json"), "utf8")));
  const tote = packSchema.parse(JSON.parse(readFileSync(path.join(demo, "tote.pack.json"), "utf8")));
  const b = best(1, () => predict(tray, tote, t, air, { model: "conduction" }));
  console.log(
    `3-D box, demo tray from composition in the demo tote (radiation, coolant): ${(n - 1).toLocaleString("en")} intervals in ${b.ms.toFixed(0)} ms (target < 2000), step ${b.value.solver.step_s} s, energy residual ${b.value.solver.energy_residual_J!.toExponential(2)} J`,
  );
}
