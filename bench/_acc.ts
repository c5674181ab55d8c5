import { predict } from "../lib/thermal/predict";
import type { Product } from "../lib/thermal/definitions";
import { centreTheta } from "../tests/helpers/series";
const k=0.5, rho=1000, cp=3600, alpha=k/(rho*cp);
const t = Float64Array.from({ length: 73 }, (_, i) => i * 300);
for (const n of [8]) for (const bi of [1, 5]) {
  const hx=0.05, hy=0.03, hz=0.02; const h = bi*k/hx;
  const product: Product = { name: "b", shape: { kind: "box", x_m: 2*hx, y_m: 2*hy, z_m: 2*hz }, properties: { density_kg_m3: rho, cp_J_kgK: cp, k_W_mK: k }, initial_C: 20, h_W_m2K: h };
  const t0 = performance.now();
  const p = predict(product, undefined, t, new Float64Array(t.length), { model: "conduction", intervals: n });
  let err = 0;
  for (let i = 1; i < t.length; i++) {
    const th = (hh: number) => centreTheta("slab", h*hh/k, alpha*t[i]!/hh/hh);
    err = Math.max(err, Math.abs(p.core[i]! - 20*th(hx)*th(hy)*th(hz)));
  }
  console.log(n, bi, (performance.now()-t0).toFixed(0), "ms err", err.toFixed(4), p.solver.step_s);
}
