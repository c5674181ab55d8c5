import type { EnthalpyCurve } from "../properties/enthalpyCurve";
import type { ChainRun } from "./chain";

/**
 * A thermal network of any shape: nodes with a mass and a per-kg enthalpy curve, conductances between
 * pairs of nodes, conductances from nodes to the ambient air, an optional massless junction (the inner
 * air of a pack, eliminated exactly at every evaluation) and optional heat sources (respiration).
 * This carries the multi-dimensional conduction grids and every pack with coolant nodes or walls that
 * store heat; a plain chain still goes to `chain.ts`. Same result contract as the chain (`ChainRun`).
 */
export interface GraphNetwork {
  mass: Float64Array;
  curves: readonly EnthalpyCurve[];
  /** edge e joins nodes edgeA[e] and edgeB[e] with conductance edgeG[e], W/K */
  edgeA: Int32Array;
  edgeB: Int32Array;
  edgeG: Float64Array;
  /** conductance from each node straight to the ambient air, W/K (0 for most) */
  gAmbient: Float64Array;
  /** massless inner-air junction: conductance to the ambient and to listed nodes, W/K */
  junction: { gAmbient: number; node: Int32Array; g: Float64Array } | null;
  /** heat generated in each node, W, at node temperatures T (added to out); returns the total */
  source?: (T: Float64Array, out: Float64Array) => number;
  /** recomputes conductances from the node temperatures (conductivity, radiation), lagged one step */
  update?: (T: Float64Array, air_C: number) => void;
}

export interface GraphRun extends ChainRun {
  /** heat generated inside (respiration) over the run, J */
  generated_J: number;
}

// TR-BDF2 constants, as in chain.ts (Bank et al., 1985; Hosea and Shampine, 1996).
const GAMMA = 2 - Math.SQRT2;
const A2 = 1 / (GAMMA * (2 - GAMMA));
const B2 = (1 - GAMMA) ** 2 / (GAMMA * (2 - GAMMA));
const W2 = (1 - GAMMA) / (2 - GAMMA);
const MAX_NEWTON = 60;
const MAX_CG = 500;

class Work {
  readonly E: Float64Array; readonly T: Float64Array; readonly f: Float64Array; readonly rhs: Float64Array;
  readonly save: Float64Array; readonly r: Float64Array; readonly S: Float64Array; readonly y: Float64Array;
  readonly res: Float64Array; readonly z: Float64Array; readonly p: Float64Array; readonly q: Float64Array;
  readonly tmp: Float64Array; readonly kd: Float64Array; readonly diagK: Float64Array;
  linear = false;
  /** each stage's first CG solution from the step before (warm start) */
  readonly guess1: Float64Array; readonly guess2: Float64Array;
  constructor(n: number) {
    this.guess1 = new Float64Array(n); this.guess2 = new Float64Array(n);
    const mk = () => new Float64Array(n);
    this.E = mk(); this.T = mk(); this.f = mk(); this.rhs = mk(); this.save = mk(); this.r = mk(); this.S = mk(); this.y = mk();
    this.res = mk(); this.z = mk(); this.p = mk(); this.q = mk(); this.tmp = mk(); this.kd = mk(); this.diagK = mk();
  }
}

function temperatures(net: GraphNetwork, E: Float64Array, T: Float64Array): void {
  const curves = net.curves, mass = net.mass;
  for (let i = 0; i < E.length; i++) {
    const c = curves[i]!;
    const h = E[i]! / mass[i]!;
    T[i] = c.constantSlope === c.constantSlope ? c.T[0]! + (h - c.H[0]!) * c.constantSlope : c.tAt(h);
  }
}

/**
 * Net conductive heat flow into every node, W, for temperatures T and air temperature `air`
 * (sources not included). Returns the heat flow from the ambient into the network.
 */
function conductiveFlows(net: GraphNetwork, T: Float64Array, air: number, f: Float64Array): number {
  const n = T.length;
  const gA = net.gAmbient;
  let qAmb = 0;
  for (let i = 0; i < n; i++) {
    const q = gA[i]! * (air - T[i]!);
    f[i] = q;
    qAmb += q;
  }
  const a = net.edgeA, b = net.edgeB, g = net.edgeG;
  for (let e = 0; e < g.length; e++) {
    const i = a[e]!, j = b[e]!;
    const q = g[e]! * (T[j]! - T[i]!);
    f[i] = f[i]! + q;
    f[j] = f[j]! - q;
  }
  const J = net.junction;
  if (J) {
    let num = J.gAmbient * air, den = J.gAmbient;
    for (let k = 0; k < J.node.length; k++) {
      num += J.g[k]! * T[J.node[k]!]!;
      den += J.g[k]!;
    }
    const tj = num / den;
    for (let k = 0; k < J.node.length; k++) {
      const i = J.node[k]!;
      f[i] = f[i]! + J.g[k]! * (tj - T[i]!);
    }
    qAmb += J.gAmbient * (air - tj);
  }
  return qAmb;
}

/** out = K·x, the conductance matrix (ambient and junction included) applied to x. */
function applyK(net: GraphNetwork, x: Float64Array, out: Float64Array): void {
  conductiveFlows(net, x, 0, out);
  for (let i = 0; i < out.length; i++) out[i] = -out[i]!;
}

/** Diagonal of K (for the Jacobi preconditioner). */
function diagonalK(net: GraphNetwork, d: Float64Array): void {
  d.set(net.gAmbient);
  for (let e = 0; e < net.edgeG.length; e++) {
    d[net.edgeA[e]!] = d[net.edgeA[e]!]! + net.edgeG[e]!;
    d[net.edgeB[e]!] = d[net.edgeB[e]!]! + net.edgeG[e]!;
  }
  const J = net.junction;
  if (J) {
    let den = J.gAmbient;
    for (let k = 0; k < J.g.length; k++) den += J.g[k]!;
    for (let k = 0; k < J.g.length; k++) d[J.node[k]!] = d[J.node[k]!]! + J.g[k]! - (J.g[k]! * J.g[k]!) / den;
  }
}

/**
 * Newton on E − c·f(T(E)) = rhs. The Jacobian I + c·K·D (D = dT/dE ≥ 0, zero on a melting plateau) is
 * made symmetric positive definite by y = D^½·δE: (I + c·D^½·K·D^½)·y = D^½·r, solved by conjugate
 * gradients with a Jacobi preconditioner; then δE = r − c·K·D^½·y. Sources are evaluated at the
 * current iterate but left out of the Jacobian (a small, positive-feedback term). Returns false if
 * Newton does not converge.
 */
function implicitSolve(net: GraphNetwork, w: Work, c: number, air: number, guess: Float64Array): boolean {
  const { E, T, f, rhs, r, S, y, res, z, p, q, tmp, kd, diagK } = w;
  const n = E.length;
  diagonalK(net, diagK);
  for (let it = 0; it < MAX_NEWTON; it++) {
    temperatures(net, E, T);
    conductiveFlows(net, T, air, f);
    if (net.source) net.source(T, f);
    let scale = 0;
    for (let i = 0; i < n; i++) {
      r[i] = rhs[i]! + c * f[i]! - E[i]!;
      const curve = net.curves[i]!;
      const slope = curve.constantSlope === curve.constantSlope ? curve.constantSlope : curve.slopeAt(E[i]! / net.mass[i]!);
      S[i] = Math.sqrt(slope / net.mass[i]!);
      scale = Math.max(scale, Math.abs(E[i]!));
    }
    // CG on (I + c·S·K·S)·y = S·r, started on the first iteration from the same stage's solution of
    // the step before (the response is smooth in time, so it is close)
    let bNorm = 0;
    for (let i = 0; i < n; i++) {
      res[i] = S[i]! * r[i]!;
      bNorm += res[i]! * res[i]!;
    }
    // inexact Newton: a nonlinear network needs each correction only to 1e-6 (Newton iterates on);
    // a linear one is solved by one correction, to 1e-10
    const stop = (w.linear ? 1e-20 : 1e-12) * bNorm;
    if (it === 0) {
      y.set(guess);
      for (let i = 0; i < n; i++) tmp[i] = S[i]! * y[i]!;
      applyK(net, tmp, kd);
      for (let i = 0; i < n; i++) res[i] = res[i]! - y[i]! - c * S[i]! * kd[i]!;
    } else y.fill(0);
    if (bNorm > 0) {
      let rz = 0;
      for (let i = 0; i < n; i++) {
        z[i] = res[i]! / (1 + c * S[i]! * S[i]! * diagK[i]!);
        p[i] = z[i]!;
        rz += res[i]! * z[i]!;
      }
      for (let k = 0; k < MAX_CG; k++) {
        for (let i = 0; i < n; i++) tmp[i] = S[i]! * p[i]!;
        applyK(net, tmp, kd);
        let pq = 0;
        for (let i = 0; i < n; i++) {
          q[i] = p[i]! + c * S[i]! * kd[i]!;
          pq += p[i]! * q[i]!;
        }
        const alpha = rz / pq;
        let rr = 0;
        for (let i = 0; i < n; i++) {
          y[i] = y[i]! + alpha * p[i]!;
          res[i] = res[i]! - alpha * q[i]!;
          rr += res[i]! * res[i]!;
        }
        if (rr <= stop) break;
        let rzNew = 0;
        for (let i = 0; i < n; i++) {
          z[i] = res[i]! / (1 + c * S[i]! * S[i]! * diagK[i]!);
          rzNew += res[i]! * z[i]!;
        }
        const beta = rzNew / rz;
        rz = rzNew;
        for (let i = 0; i < n; i++) p[i] = z[i]! + beta * p[i]!;
      }
    }
    if (it === 0) guess.set(y);
    for (let i = 0; i < n; i++) tmp[i] = S[i]! * y[i]!;
    applyK(net, tmp, kd);
    let maxStep = 0;
    for (let i = 0; i < n; i++) {
      const d = r[i]! - c * kd[i]!;
      E[i] = E[i]! + d;
      maxStep = Math.max(maxStep, Math.abs(d));
    }
    // a linear network (constant capacities and conductances, no sources) is solved by one iteration;
    // what is left is the CG residual, 1e-10 of the step's change
    if (w.linear || maxStep <= 1e-12 * (scale + 1)) return true;
  }
  return false;
}

/** One TR-BDF2 step; returns [heat in from the ambient, heat generated], J, or NaN on failure. */
function step(net: GraphNetwork, w: Work, dt: number, airA: number, airB: number, out: [number, number]): boolean {
  const { E, T, f, rhs, save } = w;
  const n = E.length;
  save.set(E);
  temperatures(net, E, T);
  const qa0 = conductiveFlows(net, T, airA, f);
  const qs0 = net.source ? net.source(T, f) : 0;
  const c1 = (GAMMA * dt) / 2;
  for (let i = 0; i < n; i++) rhs[i] = E[i]! + c1 * f[i]!;
  const airMid = airA + GAMMA * (airB - airA);
  if (!implicitSolve(net, w, c1, airMid, w.guess1)) {
    E.set(save);
    return false;
  }
  temperatures(net, E, T);
  const qaM = conductiveFlows(net, T, airMid, f);
  const qsM = net.source ? net.source(T, f) : 0;
  for (let i = 0; i < n; i++) rhs[i] = A2 * E[i]! - B2 * save[i]!;
  if (!implicitSolve(net, w, W2 * dt, airB, w.guess2)) {
    E.set(save);
    return false;
  }
  temperatures(net, E, T);
  const qa1 = conductiveFlows(net, T, airB, f);
  const qs1 = net.source ? net.source(T, f) : 0;
  out[0] = A2 * c1 * (qa0 + qaM) + W2 * dt * qa1;
  out[1] = A2 * c1 * (qs0 + qsM) + W2 * dt * qs1;
  return true;
}

/**
 * Integrates the network through the samples (air linear between them) with `substeps[k]` equal
 * TR-BDF2 steps in interval k. A step whose Newton iteration fails is split in two (to 2⁻¹⁰ of it).
 */
export function runGraph(net: GraphNetwork, t_s: Float64Array, air_C: Float64Array, initialEnthalpy_J: Float64Array, substeps: Int32Array): GraphRun {
  const n = net.mass.length;
  const ns = t_s.length;
  const w = new Work(n);
  w.linear = !net.update && !net.source && net.curves.every((c) => Number.isFinite(c.constantSlope));
  w.E.set(initialEnthalpy_J);
  const out = new Float64Array(ns * n);
  temperatures(net, w.E, w.T);
  out.set(w.T, 0);
  const stored = () => w.E.reduce((s, e) => s + e, 0);
  const storedStart_J = stored();
  let heatIn = 0, generated = 0, steps = 0;
  const q: [number, number] = [0, 0];
  const advance = (dt: number, a0: number, a1: number, depth: number): void => {
    if (net.update) {
      temperatures(net, w.E, w.T);
      net.update(w.T, a0);
    }
    if (!step(net, w, dt, a0, a1, q)) {
      if (depth >= 10) throw new Error("the implicit solver did not converge, even on a step of 1/1024 of the interval");
      const am = (a0 + a1) / 2;
      advance(dt / 2, a0, am, depth + 1);
      advance(dt / 2, am, a1, depth + 1);
      return;
    }
    heatIn += q[0];
    generated += q[1];
    steps++;
  };
  for (let k = 1; k < ns; k++) {
    const m = substeps[k - 1]!;
    const dt = (t_s[k]! - t_s[k - 1]!) / m;
    const a0 = air_C[k - 1]!, a1 = air_C[k]!;
    for (let j = 0; j < m; j++) advance(dt, a0 + ((a1 - a0) * j) / m, a0 + ((a1 - a0) * (j + 1)) / m, 0);
    temperatures(net, w.E, w.T);
    out.set(w.T, k * n);
  }
  return { T: out, heatIn_J: heatIn, generated_J: generated, storedStart_J, storedEnd_J: stored(), steps, endE_J: Float64Array.from(w.E) };
}
