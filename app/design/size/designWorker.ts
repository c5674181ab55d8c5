// Runs sizing and Monte Carlo studies off the page's thread: progress messages, and the page can
// cancel by ending the worker.
import { size } from "@/lib/design/sizing";
import { monteCarlo, type UncertaintySpec } from "@/lib/uncertainty/monteCarlo";
import { withValue, type DesignVariable } from "@/lib/design/vary";
import { predict } from "@/lib/thermal/predict";
import type { Pack, Product, ModelChoice } from "@/lib/thermal/definitions";
import type { LimitSet } from "@/lib/exposure/limits";

type Job =
  | { type: "size"; t_s: number[]; air_C: number[]; product: Product; pack?: Pack; limits: LimitSet; variable: DesignVariable; min: number; max: number; model: ModelChoice }
  | { type: "mc"; t_s: number[]; air_C: number[]; product: Product; pack?: Pack; limits: LimitSet; spec: UncertaintySpec; model: ModelChoice; at?: { variable: DesignVariable; value: number } };

self.onmessage = (e: MessageEvent<Job>) => {
  const job = e.data;
  const series = { t_s: Float64Array.from(job.t_s), air_C: Float64Array.from(job.air_C) };
  const progress = (fraction: number) => self.postMessage({ type: "progress", fraction });
  try {
    if (job.type === "size") {
      const r = size({ series, product: job.product, pack: job.pack, limits: job.limits, variable: job.variable, min: job.min, max: job.max, model: job.model, onProgress: progress });
      self.postMessage({ type: "done", result: { ...r, core_at_value: r.core_at_value ? Array.from(r.core_at_value) : null } });
    } else {
      // the design value the study runs at (e.g. the boundary found by sizing); else the definitions as stored
      const d = job.at ? withValue(job.product, job.pack, job.at.variable, job.at.value) : { product: job.product, pack: job.pack };
      const r = monteCarlo(series, d.product, d.pack, job.limits, job.spec, job.model, { onProgress: progress });
      // the prediction with every input at its nominal value, drawn over the band
      const nominal = predict(d.product, d.pack, series.t_s, series.air_C, { model: job.model }).core;
      self.postMessage({ type: "done", result: { ...r, p05: Array.from(r.p05), p50: Array.from(r.p50), p95: Array.from(r.p95), deterministic: Array.from(nominal) } });
    }
  } catch (err) {
    self.postMessage({ type: "error", message: (err as Error).message });
  }
};
