import type { ModelChoice, Pack, Product } from "./definitions";
import { resolveProduct, type ResolvedProduct } from "./resolve";
import { resistances, type Resistances } from "./resistances";
import { buildNetwork, shellResistance, type BuiltNetwork } from "./network";
import { runChain } from "./solvers/chain";
import { lumpedResponse } from "./lumped";
import { readableDuration } from "./screening";

/** The lumped-capacitance criterion Bi < 0.1 (Incropera et al., Fundamentals of Heat and Mass Transfer, §5.1–5.2; a rule of thumb). */
export const LUMPED_BIOT_LIMIT = 0.1;
/** Internal-step accuracy target: results change by at most this much when the step is halved, K. */
export const STEP_TOLERANCE_K = 0.01;
/** Shells of the 1-D conduction model; the tests show the centre within 0.01 K of the series solution at this count. */
export const DEFAULT_SHELLS = 40;

export interface PredictOptions {
  model: ModelChoice;
  shells?: number;
}

export interface ScreeningResult {
  biot: number | null;
  tau_s: number;
  tau_readable: string;
  lc_m: number | null;
  r_total_K_W: number;
  c_total_J_K: number;
  model: "lumped" | "conduction";
  reason: string;
  resistances: Resistances["items"];
  u_product_W_m2K: number;
  h_radiation_W_m2K: number;
  h_eff_W_m2K: number;
  mass_kg: number;
  area_m2: number;
  material: string;
  geometry_note?: string;
}

export interface SolverReport {
  method: "exact lumped update" | "TR-BDF2 enthalpy network";
  /** internal step used, s (the finer of the last two runs); null for the exact update */
  step_s: number | null;
  /** largest change at any sample when the step was halved, K */
  halving_change_K: number | null;
  shells: number;
  nodes: number;
  /** heat in from the air minus change in stored enthalpy over the run, J (energy balance) */
  energy_residual_J: number | null;
}

export interface Prediction {
  screening: ScreeningResult;
  core: Float64Array;
  surface: Float64Array;
  mean: Float64Array;
  coolant: Float64Array | null;
  solver: SolverReport;
  /** when the lumped model is outside its range: the largest |lumped − conduction| core difference, K */
  lumped_vs_conduction_K: number | null;
}

function mean(a: Float64Array): number {
  let s = 0;
  for (const x of a) s += x;
  return s / a.length;
}

function screen(p: ResolvedProduct, r: Resistances, choice: ModelChoice): ScreeningResult {
  const cp = p.material.apparentCp(p.product.initial_C);
  const C = p.mass_kg * cp;
  const tau = r.r_total_K_W * C;
  const h_eff = 1 / (r.r_total_K_W * p.area_m2);
  const lc = p.volume_m3 !== null ? p.volume_m3 / p.area_m2 : null;
  const biot = lc !== null && p.k_W_mK !== null ? (h_eff * lc) / p.k_W_mK : null;
  const canConduct = p.geometry !== null && p.k_W_mK !== null;
  let model: "lumped" | "conduction";
  let reason: string;
  const bi = biot === null ? "" : `Bi = ${biot.toPrecision(2)}`;
  if (choice === "lumped") {
    model = "lumped";
    reason = `lumped model chosen by the user${biot !== null && biot >= LUMPED_BIOT_LIMIT ? ` although ${bi} ≥ ${LUMPED_BIOT_LIMIT}: the core will lag more than predicted` : biot !== null ? ` (${bi})` : ""}`;
  } else if (choice === "conduction") {
    if (!canConduct) throw new Error("the conduction model needs the product's shape and conductivity");
    model = "conduction";
    reason = `1-D conduction chosen by the user${biot !== null ? ` (${bi})` : ""}`;
  } else if (biot === null) {
    model = "lumped";
    reason = "Biot number not checked (shape or density, and conductivity, are needed): lumped model used, and the true core may lag the prediction";
  } else if (biot < LUMPED_BIOT_LIMIT) {
    model = "lumped";
    reason = `${bi} < ${LUMPED_BIOT_LIMIT}: internal gradients are small, one temperature stands for the whole product`;
    if (biot >= 0.05 && canConduct) {
      reason += "; near the limit the centre can still lag the lumped estimate late in a response (compare with --model conduction)";
    }
  } else if (!canConduct) {
    model = "lumped";
    reason = `${bi} ≥ ${LUMPED_BIOT_LIMIT}, but conduction needs a shape: lumped model used, and the true core will lag the prediction`;
  } else {
    model = "conduction";
    reason = `${bi} ≥ ${LUMPED_BIOT_LIMIT}: temperature differs inside the product, so 1-D conduction is used`;
  }
  return {
    biot,
    tau_s: tau,
    tau_readable: readableDuration(tau),
    lc_m: lc,
    r_total_K_W: r.r_total_K_W,
    c_total_J_K: C,
    model,
    reason,
    resistances: r.items,
    u_product_W_m2K: r.u_product_W_m2K,
    h_radiation_W_m2K: r.h_radiation_W_m2K,
    h_eff_W_m2K: h_eff,
    mass_kg: p.mass_kg,
    area_m2: p.area_m2,
    material: p.material.description,
    ...(model === "conduction" && p.geometry?.conduction.note ? { geometry_note: p.geometry.conduction.note } : {}),
  };
}

/**
 * The screening alone (no trace needed): what the product and pack editors show as the user types.
 * Radiation is linearised about tMean_C (default: the product's initial temperature).
 */
export function screenDefinition(product: Product, pack: Pack | undefined, model: ModelChoice = "auto", tMean_C = product.initial_C): ScreeningResult {
  const p = resolveProduct(product);
  return screen(p, resistances(product, p.geometry, p.area_m2, pack, tMean_C), model);
}

interface Channels {
  core: Float64Array;
  surface: Float64Array;
  mean: Float64Array;
  coolant: Float64Array | null;
}

function readChannels(b: BuiltNetwork, p: ResolvedProduct, T: Float64Array, air: Float64Array, ns: number): Channels {
  const n = b.net.mass.length;
  const core = new Float64Array(ns);
  const surface = new Float64Array(ns);
  const meanT = new Float64Array(ns);
  const coolant = b.coolantNode >= 0 ? new Float64Array(ns) : null;
  const first = b.firstProductNode;
  const pm = b.net.mass.subarray(first);
  const totalM = pm.reduce((s, m) => s + m, 0);
  const geo = p.geometry?.conduction;
  for (let k = 0; k < ns; k++) {
    const row = k * n;
    const outside = coolant ? T[row]! : air[k]!;
    if (coolant) coolant[k] = T[row]!;
    if (b.shells === 1) {
      core[k] = surface[k] = meanT[k] = T[row + first]!;
      continue;
    }
    // centre: the profile is even about the centre (T ≈ a + b·r²); extrapolate from the two innermost nodes
    const t0 = T[row + n - 1]!, t1 = T[row + n - 2]!;
    core[k] = t0 - (t1 - t0) / 8;
    const tOuter = T[row + first]!;
    const rh = p.material.linear ? b.rHalfOuter_K_W : shellResistance(geo!, b.radii[0]!, geo!.half_m, p.material.conductivity(tOuter));
    surface[k] = tOuter + ((outside - tOuter) * rh) / (rh + b.rOutside_K_W);
    let s = 0;
    for (let i = first; i < n; i++) s += b.net.mass[i]! * T[row + i]!;
    meanT[k] = s / totalM;
  }
  return { core, surface, mean: meanT, coolant };
}

function maxDiff(a: Channels, b: Channels): number {
  let d = 0;
  const pairs: Array<[Float64Array | null, Float64Array | null]> = [[a.core, b.core], [a.surface, b.surface], [a.mean, b.mean], [a.coolant, b.coolant]];
  for (const [x, y] of pairs) {
    if (!x || !y) continue;
    for (let i = 0; i < x.length; i++) d = Math.max(d, Math.abs(x[i]! - y[i]!));
  }
  return d;
}

function medianStep(t: Float64Array): number {
  const d = Array.from({ length: t.length - 1 }, (_, i) => t[i + 1]! - t[i]!).sort((a, b) => a - b);
  return d[d.length >> 1] ?? 1;
}

/** Runs the network with step halving until two runs agree within STEP_TOLERANCE_K at every sample. */
function solveNetwork(b: BuiltNetwork, p: ResolvedProduct, t: Float64Array, air: Float64Array): { ch: Channels; solver: SolverReport } {
  let step = Math.max(1, medianStep(t));
  const once = (s: number) => {
    const run = runChain(b.net, t, air, b.initial_C, s);
    return { run, ch: readChannels(b, p, run.T, air, t.length) };
  };
  let coarse = once(step);
  let fine = once(step / 2);
  let change = maxDiff(coarse.ch, fine.ch);
  for (let i = 0; i < 14 && change > STEP_TOLERANCE_K; i++) {
    step /= 2;
    coarse = fine;
    fine = once(step / 2);
    change = maxDiff(coarse.ch, fine.ch);
  }
  if (change > STEP_TOLERANCE_K) throw new Error(`the solver could not reach ${STEP_TOLERANCE_K} K by halving the step (last change ${change.toFixed(4)} K)`);
  return {
    ch: fine.ch,
    solver: {
      method: "TR-BDF2 enthalpy network",
      step_s: step / 2,
      halving_change_K: change,
      shells: b.shells,
      nodes: b.net.mass.length,
      energy_residual_J: fine.run.heatIn_J - (fine.run.storedEnd_J - fine.run.storedStart_J),
    },
  };
}

function runModel(p: ResolvedProduct, pack: Pack | undefined, r: Resistances, model: "lumped" | "conduction", shells: number, t: Float64Array, air: Float64Array, tau: number) {
  const hasCoolant = (pack?.coolants ?? []).some((c) => c.mass_kg > 0);
  if (model === "lumped" && p.material.linear && !hasCoolant) {
    const core = lumpedResponse(t, air, p.product.initial_C, tau);
    const solver: SolverReport = { method: "exact lumped update", step_s: null, halving_change_K: null, shells: 1, nodes: 1, energy_residual_J: null };
    return { ch: { core, surface: core, mean: core, coolant: null } as Channels, solver };
  }
  const b = buildNetwork(p, pack, r, model, shells);
  return solveNetwork(b, p, t, air);
}

/**
 * Predicts product temperatures through an air trace (gaps already bridged; times in epoch s).
 * Screening first (Bi, tau, resistances), then the chosen or automatic model. When the lumped model
 * is outside its range (Bi ≥ 0.1) and conduction is possible, both run and their core difference is reported.
 */
export function predict(product: Product, pack: Pack | undefined, t_s: Float64Array, air_C: Float64Array, options: PredictOptions): Prediction {
  const p = resolveProduct(product);
  // only radiation needs the mean temperature (h_r is linearised about it)
  const tMean = pack?.emissivity ? (mean(air_C) + product.initial_C) / 2 : product.initial_C;
  const r = resistances(product, p.geometry, p.area_m2, pack, tMean);
  const screening = screen(p, r, options.model);
  const shells = options.shells ?? DEFAULT_SHELLS;
  const main = runModel(p, pack, r, screening.model, shells, t_s, air_C, screening.tau_s);
  let lumpedVsConduction: number | null = null;
  const outOfRange = screening.biot !== null && screening.biot >= LUMPED_BIOT_LIMIT && p.geometry !== null && p.k_W_mK !== null;
  if (outOfRange) {
    const other = runModel(p, pack, r, screening.model === "lumped" ? "conduction" : "lumped", shells, t_s, air_C, screening.tau_s);
    let d = 0;
    for (let i = 0; i < t_s.length; i++) d = Math.max(d, Math.abs(other.ch.core[i]! - main.ch.core[i]!));
    lumpedVsConduction = d;
    screening.reason += `; on this trace the lumped core differs from the conduction core by up to ${d.toFixed(2)} K`;
  }
  return { screening, ...main.ch, solver: main.solver, lumped_vs_conduction_K: lumpedVsConduction };
}
