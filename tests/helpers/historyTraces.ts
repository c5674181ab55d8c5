// Generated air traces for the history-profile tests and bench (invented data): each trace samples at its
// own interval with its own offset, so a common grid falls between samples.
import { mulberry32 } from "../../lib/uncertainty/random";

export const HISTORY_T0_S = Date.parse("2026-06-16T04:00:00Z") / 1000;

export function generatedTrace(j: number, seed = 7, hours = 10): { t_s: Float64Array; air_C: Float64Array } {
  const rnd = mulberry32(seed * 1000 + j);
  const dt = 60 + 30 * (j % 10);
  const n = Math.floor((hours * 3600) / dt) + 1;
  const t_s = Float64Array.from({ length: n }, (_, i) => HISTORY_T0_S + 37 * j + i * dt);
  const air_C = Float64Array.from({ length: n }, (_, i) => 4 + 3 * Math.sin(i / 7 + j) + 2 * rnd());
  return { t_s, air_C };
}
