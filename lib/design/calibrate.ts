import { levenbergMarquardt } from "ml-levenberg-marquardt";
import { jStat } from "jstat";
import { lumpedResponse } from "../thermal/lumped";
import { resolveProduct } from "../thermal/resolve";
import { screenDefinition } from "../thermal/predict";
import type { Pack, Product } from "../thermal/definitions";

export interface CalibrationOptions {
  fitInitial: boolean;
  fitOffset: boolean;
  /** warn when the fitted R_total and the one computed from the definitions differ by more than this factor */
  mismatchFactor: number;
}

export interface CalibrationResult {
  tau_s: number;
  tau_ci95_s: [number, number];
  initial_C: number;
  initial_ci95_C?: [number, number];
  offset_K?: number;
  offset_ci95_K?: [number, number];
  rmse_K: number;
  samples: number;
  /** lag-1 autocorrelation of the residuals (near 0 for a model that captures the dynamics) */
  residual_lag1: number;
  residuals_K: Float64Array;
  fitted_C: Float64Array;
  r_total_K_W?: number;
  h_eff_W_m2K?: number;
  r_total_from_definition_K_W?: number;
  warnings: string[];
  iterations: number;
}

function invert(m: number[][]): number[][] {
  // Gauss–Jordan with partial pivoting, for the small (≤ 3×3) normal-equation matrix.
  const n = m.length;
  const a = m.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(a[r]![c]!) > Math.abs(a[p]![c]!)) p = r;
    [a[c], a[p]] = [a[p]!, a[c]!];
    const d = a[c]![c]!;
    if (d === 0) throw new Error("the fit is degenerate: parameters cannot be told apart from this trace");
    for (let j = 0; j < 2 * n; j++) a[c]![j] = a[c]![j]! / d;
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = a[r]![c]!;
      for (let j = 0; j < 2 * n; j++) a[r]![j] = a[r]![j]! - f * a[c]![j]!;
    }
  }
  return a.map((row) => row.slice(n));
}

/**
 * Fits the lumped model to a measured product probe: tau (always), and optionally the initial
 * temperature and a constant sensor offset, by Levenberg–Marquardt least squares (ml-levenberg-marquardt).
 * tau is fitted as ln(tau), which keeps the problem well scaled from minutes to days. Confidence
 * intervals come from the covariance s²·(JᵀJ)⁻¹ at the optimum with Student's t quantile, and hold for
 * independent residuals: with autocorrelated residuals they are too narrow, and the result says so.
 */
export function calibrateLumped(
  t_s: Float64Array,
  air_C: Float64Array,
  probe_C: Float64Array,
  options: CalibrationOptions,
  definitions?: { product: Product; pack?: Pack },
): CalibrationResult {
  const idx: number[] = [];
  for (let i = 0; i < probe_C.length; i++) if (!Number.isNaN(probe_C[i]!)) idx.push(i);
  if (idx.length < 5) throw new Error("the probe channel has fewer than 5 readings: too few to fit");
  const firstProbe = probe_C[idx[0]!]!;
  const names = ["ln_tau", ...(options.fitInitial ? ["initial"] : []), ...(options.fitOffset ? ["offset"] : [])];
  const unpack = (p: number[]) => {
    let k = 1;
    const tau = Math.exp(p[0]!);
    const initial = options.fitInitial ? p[k++]! : firstProbe;
    const offset = options.fitOffset ? p[k++]! : 0;
    return { tau, initial, offset };
  };
  const model = (p: number[]) => {
    const { tau, initial, offset } = unpack(p);
    const T = lumpedResponse(t_s, air_C, initial, tau);
    return (i: number) => T[i]! + offset;
  };
  const data = { x: idx, y: idx.map((i) => probe_C[i]!) };
  const ssr = (p: number[]) => {
    const f = model(p);
    return idx.reduce((s, i) => s + (f(i) - probe_C[i]!) ** 2, 0);
  };
  // Several starting time constants, from 10 minutes to 2 days; keep the best fit.
  let guesses = [600, 3600, 4 * 3600, 16 * 3600, 48 * 3600];
  if (definitions) guesses = [screenDefinition(definitions.product, definitions.pack).tau_s, ...guesses];
  let best: { p: number[]; ssr: number; iterations: number } | null = null;
  for (const g of guesses) {
    const init = [Math.log(g), ...(options.fitInitial ? [firstProbe] : []), ...(options.fitOffset ? [0] : [])];
    const r = levenbergMarquardt(data, model, { initialValues: init, maxIterations: 200, errorTolerance: 1e-12, gradientDifference: 1e-6, damping: 1e-2 });
    const s = ssr(r.parameterValues);
    if (Number.isFinite(s) && (!best || s < best.ssr)) best = { p: r.parameterValues, ssr: s, iterations: r.iterations };
  }
  const p = best!.p;
  const n = idx.length, k = names.length;
  // Jacobian by central differences at the optimum.
  const f0 = model(p);
  const J = idx.map(() => new Array<number>(k).fill(0));
  for (let j = 0; j < k; j++) {
    const h = 1e-6 * Math.max(1, Math.abs(p[j]!));
    const up = [...p], dn = [...p];
    up[j] = p[j]! + h;
    dn[j] = p[j]! - h;
    const fu = model(up), fd = model(dn);
    idx.forEach((i, r) => (J[r]![j] = (fu(i) - fd(i)) / (2 * h)));
  }
  const JtJ = Array.from({ length: k }, (_, a) => Array.from({ length: k }, (_, b) => J.reduce((s, row) => s + row[a]! * row[b]!, 0)));
  const dof = Math.max(1, n - k);
  const s2 = best!.ssr / dof;
  const cov = invert(JtJ).map((row) => row.map((v) => v * s2));
  const tq = jStat.studentt.inv(0.975, dof);
  const se = (j: number) => Math.sqrt(Math.max(0, cov[j]![j]!));
  const { tau, initial, offset } = unpack(p);
  const residuals = Float64Array.from(idx, (i) => probe_C[i]! - f0(i));
  const fitted = Float64Array.from({ length: t_s.length }, (_, i) => f0(i));
  const mean = residuals.reduce((a, b) => a + b, 0) / n;
  let num = 0, den = 0;
  for (let i = 0; i < n; i++) {
    den += (residuals[i]! - mean) ** 2;
    if (i > 0) num += (residuals[i]! - mean) * (residuals[i - 1]! - mean);
  }
  const lag1 = den > 0 ? num / den : 0;
  const warnings: string[] = [];
  // common practice: |r1| above 0.5 means the residuals carry structure the model does not explain
  if (lag1 > 0.5) {
    warnings.push(`the residuals are strongly autocorrelated (lag-1 r = ${lag1.toFixed(2)}): the lumped model misses part of the dynamics, and the confidence intervals are too narrow`);
  }
  const result: CalibrationResult = {
    tau_s: tau,
    tau_ci95_s: [tau * Math.exp(-tq * se(0)), tau * Math.exp(tq * se(0))],
    initial_C: initial,
    rmse_K: Math.sqrt(best!.ssr / n),
    samples: n,
    residual_lag1: lag1,
    residuals_K: residuals,
    fitted_C: fitted,
    warnings,
    iterations: best!.iterations,
  };
  let j = 1;
  if (options.fitInitial) {
    result.initial_ci95_C = [initial - tq * se(j), initial + tq * se(j)];
    j++;
  }
  if (options.fitOffset) {
    result.offset_K = offset;
    result.offset_ci95_K = [offset - tq * se(j), offset + tq * se(j)];
  }
  if (definitions) {
    const rp = resolveProduct(definitions.product);
    const C = rp.mass_kg * rp.material.apparentCp(definitions.product.initial_C);
    const screening = screenDefinition(definitions.product, definitions.pack);
    result.r_total_K_W = tau / C;
    result.h_eff_W_m2K = 1 / (result.r_total_K_W * rp.area_m2);
    result.r_total_from_definition_K_W = screening.r_total_K_W;
    const ratio = result.r_total_K_W / screening.r_total_K_W;
    if (ratio > options.mismatchFactor || ratio < 1 / options.mismatchFactor) {
      warnings.push(`the fitted R_total (${result.r_total_K_W.toPrecision(3)} K/W) differs from the definitions' (${screening.r_total_K_W.toPrecision(3)} K/W) by a factor of ${Math.max(ratio, 1 / ratio).toFixed(1)}`);
    }
    if (screening.biot !== null && screening.biot >= 0.1) {
      warnings.push(`Bi = ${screening.biot.toPrecision(2)} ≥ 0.1: one temperature does not stand for the whole product, so a lumped tau is only an effective value`);
    }
  }
  return result;
}
