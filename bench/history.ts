// History profile: time to build a 95th-percentile profile from many traces, and a cross-check of the
// per-step percentile against numpy's np.percentile (default method "linear") when python3 + numpy exist.
import { spawnSync } from "node:child_process";
import { performance } from "node:perf_hooks";
import { historyEnvelope } from "../lib/shipment/historyProfile";
import { generatedTrace } from "../tests/helpers/historyTraces";

export function benchHistory(): void {
  const traces = Array.from({ length: 200 }, (_, j) => generatedTrace(j, 11, 5 * 24));
  const t0 = performance.now();
  const env = historyEnvelope(traces, { percentile: 95, step_s: 60, align: "departure" });
  const ms = performance.now() - t0;
  console.log(`history profile: 200 traces × 5 days, 1-min grid (${env.offset_s.length} steps): ${ms.toFixed(0)} ms`);

  const small = Array.from({ length: 7 }, (_, j) => generatedTrace(j));
  const e = historyEnvelope(small, { percentile: 95, step_s: 300, align: "departure" });
  const script = "import json,sys\nimport numpy as np\nd=json.load(sys.stdin)\nprint(json.dumps(np.percentile(np.array(d),95,axis=0).tolist()))";
  const py = spawnSync("python3", ["-c", script], { input: JSON.stringify(e.traces_C.map((c) => Array.from(c))), encoding: "utf8" });
  if (py.status !== 0) {
    console.log(`history profile vs numpy: skipped (python3 with numpy not available: ${(py.stderr || String(py.error)).split("\n")[0]})`);
    return;
  }
  const ref = JSON.parse(py.stdout) as number[];
  const worst = Math.max(...ref.map((v, i) => Math.abs(v - e.percentile_C[i]!)));
  console.log(`history profile vs numpy.percentile(q=95, linear) on ${ref.length} grid steps of 7 traces: largest difference ${worst.toExponential(2)} K`);
}
