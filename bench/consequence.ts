// Growth and shelf-life benchmarks: each model with its guard band (five integrals of the history) over a
// 30-day, 1-minute core history; accuracy read against values the formulas give in closed form.
import { performance } from "node:perf_hooks";
import { evaluateConsequence } from "../lib/consequence/evaluate";
import { growthModelSchema, shelfLifeModelSchema } from "../lib/consequence/definitions";
import { mulberry32 } from "../lib/uncertainty/random";

export function benchConsequence(): void {
  const n = 30 * 24 * 60 + 1;
  const rand = mulberry32(11);
  const t = Float64Array.from({ length: n }, (_, i) => i * 60);
  const v = Float64Array.from(t, (ti) => 4 + 3 * Math.sin((2 * Math.PI * ti) / 86400) + (rand() - 0.5));
  const ch = { t_s: t, value_C: v, uncertainSpans: [], modelUncertainty_K: 0 };
  const models = [
    growthModelSchema.parse({ id: "g", kind: "growth", organism: "bench", b_per_C_sqrt_h: 0.02, tmin_C: -1.5, lag_h: 20, initial_log10: 2, max_log10: 8, source: "bench" }),
    growthModelSchema.parse({ id: "gx", kind: "growth", organism: "bench", b_per_C_sqrt_h: 0.02, tmin_C: -1.5, tmax_C: 45, c_per_C: 0.3, source: "bench" }),
    shelfLifeModelSchema.parse({ id: "sq", kind: "shelf_life", reference_C: 4, shelf_life_days: 10, dependence: "sqrt", tmin_C: -10 }),
    shelfLifeModelSchema.parse({ id: "ar", kind: "shelf_life", reference_C: 4, shelf_life_days: 10, dependence: "arrhenius", ea_kJ_mol: 80 }),
    shelfLifeModelSchema.parse({ id: "q", kind: "shelf_life", reference_C: 4, shelf_life_days: 10, dependence: "q10", q10: 3 }),
  ];
  const parts = models.map((m) => {
    let ms = Infinity;
    for (let r = 0; r < 3; r++) {
      const t0 = performance.now();
      evaluateConsequence(m, ch, 0.5, 4);
      ms = Math.min(ms, performance.now() - t0);
    }
    return `${m.kind === "growth" ? (m.tmax_C ? "growth (extended)" : "growth") : `shelf life (${m.dependence})`} ${ms.toFixed(0)} ms`;
  });
  // accuracy: at constant 8 °C for 30 days the Arrhenius consumption is 30·exp((Ea/R)(1/277.15 − 1/281.15)) days exactly
  const flat = { ...ch, value_C: new Float64Array(n).fill(8) };
  const ar = evaluateConsequence(models[3]!, flat, 0, 4);
  const exact = 30 * Math.exp((80000 / 8.314462618) * (1 / 277.15 - 1 / 281.15));
  console.log(`growth and shelf life, each with its guard band (5 integrals), on a 30-day 1-minute history (${n.toLocaleString("en")} samples): ${parts.join(", ")}; Arrhenius at constant 8 °C relative error ${(Math.abs(ar.shelf_life_consumed_days! - exact) / exact).toExponential(1)}`);
}
