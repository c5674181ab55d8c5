import type { ModelChoice, Pack, Product } from "./definitions";
import { resolveProduct, type ResolvedProduct } from "./resolve";
import { resistances, type Resistances } from "./resistances";
import { buildNetwork, shellResistance, type BuiltNetwork } from "./network";
import { runChain } from "./solvers/chain";
import { runGraph } from "./solvers/graph";
import { buildGraph } from "./graphNetwork";
import { boxGrid, cylinderGrid, lumpedGrid, shellGrid, type ProductGrid } from "./grids";
import { describeRespiration } from "./respiration";
import { lumpedResponse } from "./lumped";
import { readableDuration } from "./screening";

/** The lumped-capacitance criterion Bi < 0.1 (Incropera et al., Fundamentals of Heat and Mass Transfer, §5.1–5.2; a rule of thumb). */
export const LUMPED_BIOT_LIMIT = 0.1;
/** Internal-step accuracy target: results change by at most this much when the step is halved, K. */
export const STEP_TOLERANCE_K = 0.01;
/** Shells of the 1-D conduction model; the tests show the centre within 0.01 K of the series solution at this count. */
export const DEFAULT_SHELLS = 40;
/** Intervals per half-axis of the 3-D box grid and of the r–z cylinder grid (the tests show the centre within 0.1 K of the product solutions on a 20 K step). */
export const DEFAULT_BOX_INTERVALS = 6;
export const DEFAULT_RZ_INTERVALS = 12;
/** The freezing range that matters for model choice: most latent heat is released within 10 K below the initial freezing point (Tchigeov's ice fraction reaches 85 % of the water there). */
const FREEZING_RANGE_K = 10;

export interface PredictOptions {
  model: ModelChoice;
  shells?: number;
  /** intervals per half-axis of multi-dimensional grids (default DEFAULT_BOX_INTERVALS / DEFAULT_RZ_INTERVALS) */
  intervals?: number;
}

/** Which conduction model a shape gets: multi-dimensional where the shape needs it, or the 1-D shortcut. */
export type ConductionKind = "3-D box" | "r–z cylinder" | "1-D";

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
  /** the conduction model used (when model is conduction) */
  conduction_kind?: ConductionKind;
  /** the smallest conductivity over the temperature range the product will meet, W/(m·K), and that range, °C */
  k_min_W_mK?: number | null;
  range_C?: [number, number];
  /** initial freezing point and where it came from */
  freezing_point_C?: number | null;
  freezing_source?: "given" | "estimated" | "none" | "not needed";
  /** things the review must state: estimated or missing freezing point, coolant and wall treatment, respiration */
  notes: string[];
}

export interface SolverReport {
  method: "exact lumped update" | "TR-BDF2 enthalpy network" | "TR-BDF2 enthalpy network (graph, conjugate gradients)";
  /** the grid of a graph model ("3-D box, one octant by symmetry, 11×11×11 nodes") */
  grid?: string;
  /** internal step used, s (the finer of the last two runs); null for the exact update */
  step_s: number | null;
  /** largest change at any sample when the step was halved, K */
  halving_change_K: number | null;
  shells: number;
  nodes: number;
  /** heat in from the air (plus heat generated) minus change in stored enthalpy over the run, J (energy balance) */
  energy_residual_J: number | null;
  /** heat of respiration generated over the run, J, when the product respires */
  generated_J?: number;
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

/** Which conduction model "conduction" means for this product's shape. */
export function conductionKindFor(p: ResolvedProduct, choice: ModelChoice): ConductionKind {
  if (choice === "conduction-1d") return "1-D";
  const kind = p.product.shape?.kind;
  // a slab is conducted across its thickness (its edges' area counted on the faces: the safe side)
  if (kind === "box") return "3-D box";
  if (kind === "cylinder") return "r–z cylinder";
  return "1-D";
}

/** Which way a 1-D shortcut errs, for the review. */
function shortcutNote(p: ResolvedProduct): string | undefined {
  const shape = p.product.shape;
  const geo = p.geometry?.conduction;
  if (!shape || !geo) return undefined;
  if (shape.kind === "box" && geo.kind === "sphere")
    return `${geo.note}: a 1-D shortcut that responds more slowly than the real box (heavier per unit surface), so it under-predicts warming and cooling of the core: on the unsafe side for warm excursions; the 3-D model ("conduction") does not`;
  if (shape.kind === "box" || shape.kind === "slab")
    return `${geo.note ?? "slab conducted across its thickness only"}: a 1-D shortcut that counts the edges' area as if it were on the faces, so the core responds somewhat faster than the real one (on the safe side for warm excursions, too warm by up to a few kelvin)`;
  if (shape.kind === "cylinder")
    return "cylinder conducted radially only: a 1-D shortcut that ignores heat through the ends, so it under-predicts warming and cooling of the core of a short cylinder: on the unsafe side for warm excursions; the r–z model (\"conduction\") does not";
  return undefined;
}

export interface Range {
  lo_C: number;
  hi_C: number;
}

/** The smallest conductivity the material has over the range (checked every 0.25 K and at both ends). */
function minConductivity(p: ResolvedProduct, range: Range): number | null {
  if (p.k_W_mK === null) return null;
  if (p.material.linear) return p.k_W_mK;
  let k = Math.min(p.material.conductivity(range.lo_C), p.material.conductivity(range.hi_C));
  for (let t = range.lo_C; t < range.hi_C; t += 0.25) k = Math.min(k, p.material.conductivity(t));
  return k;
}

function screen(p: ResolvedProduct, r: Resistances, rHot: Resistances, choice: ModelChoice, range: Range): ScreeningResult {
  const cp = p.material.apparentCp(p.product.initial_C);
  const C = p.mass_kg * cp;
  const tau = r.r_total_K_W * C;
  const h_eff = 1 / (r.r_total_K_W * p.area_m2);
  // Bi that holds over the whole range: the largest h (radiation grows with temperature) and the smallest k
  const h_max = Math.max(h_eff, 1 / (rHot.r_total_K_W * p.area_m2));
  const lc = p.volume_m3 !== null ? p.volume_m3 / p.area_m2 : null;
  const kMin = minConductivity(p, range);
  const biot = lc !== null && kMin !== null ? (h_max * lc) / kMin : null;
  const canConduct = p.geometry !== null && p.k_W_mK !== null;
  const tf = p.freezing.freezing_point_C;
  const crossesFreezing = tf !== null && range.lo_C < tf && range.hi_C > tf - FREEZING_RANGE_K;
  const kNote = kMin !== null && p.k_W_mK !== null && Math.abs(kMin - p.k_W_mK) > 1e-3 * p.k_W_mK ? ` with the smallest conductivity over ${range.lo_C.toFixed(1)}…${range.hi_C.toFixed(1)} °C, k = ${kMin.toPrecision(3)} W/m·K (${p.k_W_mK.toPrecision(3)} at the start)` : "";
  let model: "lumped" | "conduction";
  let reason: string;
  const bi = biot === null ? "" : `Bi = ${biot.toPrecision(2)}${kNote}`;
  const kindOf = () => conductionKindFor(p, choice);
  if (choice === "lumped") {
    model = "lumped";
    reason = `lumped model chosen by the user${biot !== null && biot >= LUMPED_BIOT_LIMIT ? ` although ${bi} ≥ ${LUMPED_BIOT_LIMIT}: the core will lag more than predicted` : biot !== null ? ` (${bi})` : ""}${crossesFreezing ? `; the product crosses its freezing range (${tf!.toFixed(1)} °C), where a lumped model misses the frozen shell and thawed core` : ""}`;
  } else if (choice === "conduction" || choice === "conduction-1d") {
    if (!canConduct) throw new Error("the conduction model needs the product's shape and conductivity");
    model = "conduction";
    reason = `${kindOf()} conduction chosen by the user${biot !== null ? ` (${bi})` : ""}`;
  } else if (biot === null) {
    model = "lumped";
    reason = "Biot number not checked (shape or density, and conductivity, are needed): lumped model used, and the true core may lag the prediction";
  } else if (crossesFreezing && canConduct) {
    model = "conduction";
    reason = `the product crosses its freezing range (initial freezing point ${tf!.toFixed(1)} °C, temperatures ${range.lo_C.toFixed(1)}…${range.hi_C.toFixed(1)} °C): a frozen shell and a thawed core differ in conductivity and latent heat, so ${kindOf()} conduction is used (${bi})`;
  } else if (biot < LUMPED_BIOT_LIMIT) {
    model = "lumped";
    reason = `${bi} < ${LUMPED_BIOT_LIMIT}: internal gradients are small, one temperature stands for the whole product`;
    if (crossesFreezing) reason += `; the product crosses its freezing range (${tf!.toFixed(1)} °C), which a lumped model can only follow on average (conduction needs a shape and conductivity)`;
    if (biot >= 0.05 && canConduct) {
      reason += "; near the limit the centre can still lag the lumped estimate late in a response (compare with --model conduction)";
    }
  } else if (!canConduct) {
    model = "lumped";
    reason = crossesFreezing
      ? `the product crosses its freezing range (${tf!.toFixed(1)} °C), but conduction needs a shape: lumped model used, which misses the frozen shell and thawed core (${bi})`
      : `${bi} ≥ ${LUMPED_BIOT_LIMIT}, but conduction needs a shape: lumped model used, and the true core will lag the prediction`;
  } else {
    model = "conduction";
    reason = `${bi} ≥ ${LUMPED_BIOT_LIMIT}: temperature differs inside the product, so ${kindOf()} conduction is used`;
  }
  const kind = model === "conduction" ? kindOf() : undefined;
  const notes: string[] = [];
  if (p.freezing.note) notes.push(p.freezing.note);
  if (p.product.respiration) notes.push(describeRespiration(p.product.respiration));
  const geometryNote = kind === "1-D" ? shortcutNote(p) : undefined;
  if (geometryNote) notes.push(geometryNote);
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
    ...(geometryNote ? { geometry_note: geometryNote } : {}),
    ...(kind ? { conduction_kind: kind } : {}),
    k_min_W_mK: kMin,
    range_C: [range.lo_C, range.hi_C],
    freezing_point_C: p.freezing.freezing_point_C,
    freezing_source: p.freezing.source,
    notes,
  };
}

/**
 * The screening alone (no trace needed): what the product and pack editors show as the user types.
 * Radiation is evaluated at tMean_C (default: the product's initial temperature); the temperature range
 * is the initial temperature alone unless `range` is given.
 */
export function screenDefinition(product: Product, pack: Pack | undefined, model: ModelChoice = "auto", tMean_C = product.initial_C, range?: Range): ScreeningResult {
  const rg = range ?? { lo_C: product.initial_C, hi_C: product.initial_C };
  const p = resolveProduct(product, rg.lo_C);
  const r = resistances(product, p.geometry, p.area_m2, pack, tMean_C);
  const rHot = resistances(product, p.geometry, p.area_m2, pack, rg.hi_C);
  return screen(p, r, rHot, model, rg);
}

export interface Channels {
  core: Float64Array;
  surface: Float64Array;
  mean: Float64Array;
  coolant: Float64Array | null;
}

export function readChannels(b: BuiltNetwork, p: ResolvedProduct, T: Float64Array, air: Float64Array, ns: number): Channels {
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

/** A model run at one refinement level: its channels and energy bookkeeping. */
interface LevelRun {
  ch: Channels;
  heatIn_J: number;
  generated_J: number;
  storedStart_J: number;
  storedEnd_J: number;
}

/**
 * Step control for every interval: at level L interval k takes 2^L·⌈Δt_k/Δt_median⌉ equal TR-BDF2 steps,
 * so each refinement halves every step, short intervals included. Levels are refined until two
 * successive runs agree within STEP_TOLERANCE_K at every sample; the finer run is reported, with that
 * change (for a second-order scheme its own error is about a third of it).
 */
function solveWithHalving(t: Float64Array, once: (substeps: Int32Array) => LevelRun, shape: { method: SolverReport["method"]; shells: number; nodes: number; grid?: string }): { ch: Channels; solver: SolverReport } {
  const s0 = Math.max(1, medianStep(t));
  // The start is usually not a steady state (a cold coolant beside a warm product, a surface meeting a
  // different air): its fast transient gets more steps in the first two intervals (×16, ×4) so that it
  // does not force a finer step on the whole trace. Accuracy is still measured by halving everything.
  const base = Int32Array.from({ length: Math.max(0, t.length - 1) }, (_, k) => Math.max(1, Math.ceil((t[k + 1]! - t[k]!) / s0 - 1e-9)) * (k === 0 ? 16 : k === 1 ? 4 : 1));
  const level = (L: number) => once(Int32Array.from(base, (m) => m * 2 ** L));
  let L = 0;
  let coarse = level(0);
  let fine = level(1);
  let change = maxDiff(coarse.ch, fine.ch);
  while (change > STEP_TOLERANCE_K && L < 14) {
    L++;
    coarse = fine;
    fine = level(L + 1);
    change = maxDiff(coarse.ch, fine.ch);
  }
  if (change > STEP_TOLERANCE_K) throw new Error(`the solver could not reach ${STEP_TOLERANCE_K} K by halving the step (last change ${change.toFixed(4)} K)`);
  return {
    ch: fine.ch,
    solver: {
      method: shape.method,
      ...(shape.grid ? { grid: shape.grid } : {}),
      step_s: s0 / 2 ** (L + 1),
      halving_change_K: change,
      shells: shape.shells,
      nodes: shape.nodes,
      energy_residual_J: fine.heatIn_J + fine.generated_J - (fine.storedEnd_J - fine.storedStart_J),
      ...(fine.generated_J !== 0 ? { generated_J: fine.generated_J } : {}),
    },
  };
}

function solveChain(b: BuiltNetwork, p: ResolvedProduct, t: Float64Array, air: Float64Array) {
  return solveWithHalving(
    t,
    (sub) => {
      const run = runChain(b.net, t, air, b.initial_C, 1, sub, b.initialE_J);
      return { ch: readChannels(b, p, run.T, air, t.length), heatIn_J: run.heatIn_J, generated_J: 0, storedStart_J: run.storedStart_J, storedEnd_J: run.storedEnd_J };
    },
    { method: "TR-BDF2 enthalpy network", shells: b.shells, nodes: b.net.mass.length },
  );
}

export function gridFor(p: ResolvedProduct, model: "lumped" | "conduction", kind: ConductionKind, options: PredictOptions): ProductGrid {
  if (model === "lumped") return lumpedGrid(p.area_m2);
  const shape = p.product.shape!;
  if (kind === "3-D box" && shape.kind === "box") return boxGrid(shape.x_m / 2, shape.y_m / 2, shape.z_m / 2, options.intervals ?? DEFAULT_BOX_INTERVALS);
  if (kind === "r–z cylinder" && shape.kind === "cylinder") {
    const n = options.intervals ?? DEFAULT_RZ_INTERVALS;
    return cylinderGrid(shape.radius_m, shape.length_m, n, n);
  }
  return shellGrid(p.geometry!.conduction, options.shells ?? DEFAULT_SHELLS, p.area_m2);
}

function solveGraph(p: ResolvedProduct, pack: Pack | undefined, r: Resistances, grid: ProductGrid, t: Float64Array, air: Float64Array, notes: string[]) {
  const b = buildGraph(p, pack, r, grid, air[0] ?? p.product.initial_C);
  for (const n of b.notes) if (!notes.includes(n)) notes.push(n);
  const n = b.net.mass.length;
  const ns = t.length;
  return solveWithHalving(
    t,
    (sub) => {
      const fresh = buildGraph(p, pack, r, grid, air[0] ?? p.product.initial_C); // conductances are updated in place during a run
      const run = runGraph(fresh.net, t, air, fresh.initialE, sub);
      const ch: Channels = { core: new Float64Array(ns), surface: new Float64Array(ns), mean: new Float64Array(ns), coolant: fresh.coolantNodes.length ? new Float64Array(ns) : null };
      for (let k = 0; k < ns; k++) {
        const v = fresh.read(run.T.subarray(k * n, (k + 1) * n), air[k]!);
        ch.core[k] = v.core;
        ch.surface[k] = v.surface;
        ch.mean[k] = v.mean;
        if (ch.coolant) ch.coolant[k] = v.coolant!;
      }
      return { ch, heatIn_J: run.heatIn_J, generated_J: run.generated_J, storedStart_J: run.storedStart_J, storedEnd_J: run.storedEnd_J };
    },
    { method: "TR-BDF2 enthalpy network (graph, conjugate gradients)", shells: grid.cellCentredShells ? grid.share.length : 1, nodes: n, grid: grid.label },
  );
}

/** Features only the graph network carries: radiation updated every step, coolants with their own film, walls that store heat, respiration. */
export function needsGraph(p: ResolvedProduct, pack: Pack | undefined): boolean {
  if (p.product.respiration) return true;
  if (!pack) return false;
  return (pack.emissivity ?? 0) > 0 || pack.coolants.some((c) => c.mass_kg > 0 && c.area_m2 !== undefined) || pack.layers.some((l) => l.density_kg_m3 !== undefined);
}

/** Which solver a model runs on: the exact lumped update, the chain (Thomas) or the graph (conjugate gradients). */
export type SolverPath = "exact" | "chain" | "graph";

export function solverPath(p: ResolvedProduct, pack: Pack | undefined, model: "lumped" | "conduction", kind: ConductionKind): SolverPath {
  const hasCoolant = (pack?.coolants ?? []).some((c) => c.mass_kg > 0);
  const graph = needsGraph(p, pack) || (model === "conduction" && kind !== "1-D");
  if (model === "lumped" && p.material.linear && !hasCoolant && !graph) return "exact";
  return graph ? "graph" : "chain";
}

/** The range of temperatures a prediction meets (initial and air) and the mean temperature its radiation is evaluated at, as predict uses them. */
export function predictionRange(product: Product, pack: Pack | undefined, aMin: number, aMax: number, airMean: number): { range: Range; tMean_C: number } {
  return { range: { lo_C: Math.min(product.initial_C, aMin), hi_C: Math.max(product.initial_C, aMax) }, tMean_C: pack?.emissivity ? (airMean + product.initial_C) / 2 : product.initial_C };
}

function runModel(p: ResolvedProduct, pack: Pack | undefined, r: Resistances, model: "lumped" | "conduction", kind: ConductionKind, options: PredictOptions, t: Float64Array, air: Float64Array, tau: number, notes: string[]) {
  const hasCoolant = (pack?.coolants ?? []).some((c) => c.mass_kg > 0);
  const path = solverPath(p, pack, model, kind);
  const graph = path === "graph";
  if (path === "exact") {
    const core = lumpedResponse(t, air, p.product.initial_C, tau);
    const solver: SolverReport = { method: "exact lumped update", step_s: null, halving_change_K: null, shells: 1, nodes: 1, energy_residual_J: null };
    return { ch: { core, surface: core, mean: core, coolant: null } as Channels, solver };
  }
  if (graph) return solveGraph(p, pack, r, gridFor(p, model, kind, options), t, air, notes);
  if (hasCoolant) notes.push("coolant without area_m2: taken to be at the inner-air temperature (one node)");
  const b = buildNetwork(p, pack, r, model, options.shells ?? DEFAULT_SHELLS);
  return solveChain(b, p, t, air);
}

/**
 * Predicts product temperatures through an air trace (gaps already bridged; times in epoch s).
 * Screening first (Bi over the temperature range, tau, resistances, freezing range), then the chosen or
 * automatic model. When the lumped model is outside its range (Bi ≥ 0.1) and conduction is possible,
 * both run and their core difference is reported.
 */
export function predict(product: Product, pack: Pack | undefined, t_s: Float64Array, air_C: Float64Array, options: PredictOptions): Prediction {
  let aMin = Infinity, aMax = -Infinity;
  for (const a of air_C) {
    aMin = Math.min(aMin, a);
    aMax = Math.max(aMax, a);
  }
  const range: Range = { lo_C: Math.min(product.initial_C, aMin), hi_C: Math.max(product.initial_C, aMax) };
  const p = resolveProduct(product, range.lo_C);
  // the screening's radiation coefficient is evaluated at the mean temperature; the solvers update it every step
  const tMean = pack?.emissivity ? (mean(air_C) + product.initial_C) / 2 : product.initial_C;
  const r = resistances(product, p.geometry, p.area_m2, pack, tMean);
  const rHot = resistances(product, p.geometry, p.area_m2, pack, range.hi_C);
  const screening = screen(p, r, rHot, options.model, range);
  const kind = screening.conduction_kind ?? conductionKindFor(p, options.model);
  const main = runModel(p, pack, r, screening.model, kind, options, t_s, air_C, screening.tau_s, screening.notes);
  let lumpedVsConduction: number | null = null;
  const outOfRange = screening.biot !== null && screening.biot >= LUMPED_BIOT_LIMIT && p.geometry !== null && p.k_W_mK !== null;
  if (outOfRange) {
    const other = runModel(p, pack, r, screening.model === "lumped" ? "conduction" : "lumped", kind, options, t_s, air_C, screening.tau_s, []);
    let d = 0;
    for (let i = 0; i < t_s.length; i++) d = Math.max(d, Math.abs(other.ch.core[i]! - main.ch.core[i]!));
    lumpedVsConduction = d;
    screening.reason += `; on this trace the lumped core differs from the conduction core by up to ${d.toFixed(2)} K`;
  }
  return { screening, ...main.ch, solver: main.solver, lumped_vs_conduction_K: lumpedVsConduction };
}
