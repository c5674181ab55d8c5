import type { EnthalpyCurve } from "../properties/enthalpyCurve";

/**
 * A thermal network whose nodes form a chain: ambient → node 0 → node 1 → … → node n−1.
 * This covers the lumped body (one node), the inner air with coolant ahead of a product, and the
 * ladder of shells of 1-D conduction. Each node's state is its enthalpy E = m·h; T follows from it.
 */
export interface ChainNetwork {
  /** mass of each node, kg (its enthalpy curve is per kg) */
  mass: Float64Array;
  curves: readonly EnthalpyCurve[];
  /** conductance between the ambient air and node 0, W/K */
  gAmbient: number;
  /** conductance between node i and i+1, W/K (length n−1) */
  g: Float64Array;
  /** recomputes g from the node temperatures (temperature-dependent conductivity, lagged one step) */
  updateConductances?: (T: Float64Array, g: Float64Array) => void;
  /** constant conductances and piecewise-linear-free enthalpy: Newton converges in one iteration */
  linear: boolean;
}

export interface ChainRun {
  /** temperature of every node at every sample, row-major: T[sample·n + node] */
  T: Float64Array;
  /** heat that entered from the ambient over the whole run, J (same quadrature as the scheme) */
  heatIn_J: number;
  /** total enthalpy at the first and last sample, J */
  storedStart_J: number;
  storedEnd_J: number;
  /** internal steps taken, including any subdivided for Newton convergence */
  steps: number;
  /** enthalpy of every node at the last sample, J: the state a later run continues from (a live monitor) */
  endE_J: Float64Array;
}

// TR-BDF2 (Bank et al., 1985; Hosea and Shampine, 1996): a trapezoidal stage to t + γΔ, then BDF2 to
// t + Δ. Second order and L-stable, so the stiff fast modes of thin shells are damped, not ringing.
const GAMMA = 2 - Math.SQRT2;
const A2 = 1 / (GAMMA * (2 - GAMMA));
const B2 = (1 - GAMMA) ** 2 / (GAMMA * (2 - GAMMA));
const W2 = (1 - GAMMA) / (2 - GAMMA);
const MAX_NEWTON = 60;

class Workspace {
  readonly n: number;
  readonly E: Float64Array;
  readonly T: Float64Array;
  readonly Es: Float64Array;
  readonly rhs: Float64Array;
  readonly f: Float64Array;
  readonly D: Float64Array;
  readonly lo: Float64Array;
  readonly di: Float64Array;
  readonly up: Float64Array;
  readonly r: Float64Array;
  readonly save: Float64Array;
  constructor(n: number) {
    this.n = n;
    const mk = () => new Float64Array(n);
    this.E = mk(); this.T = mk(); this.Es = mk(); this.rhs = mk(); this.f = mk(); this.D = mk();
    this.lo = mk(); this.di = mk(); this.up = mk(); this.r = mk(); this.save = mk();
  }
}

function temperatures(net: ChainNetwork, E: Float64Array, T: Float64Array): void {
  const curves = net.curves, mass = net.mass;
  for (let i = 0; i < E.length; i++) {
    const c = curves[i]!;
    const h = E[i]! / mass[i]!;
    // straight-line curves (constant cp) skip the table search: the hot path of linear models
    T[i] = c.constantSlope === c.constantSlope ? c.T[0]! + (h - c.H[0]!) * c.constantSlope : c.tAt(h);
  }
}

/** Net heat flow into each node, W, for temperatures T and ambient air; returns the ambient inflow. */
function flows(net: ChainNetwork, T: Float64Array, air: number, f: Float64Array): number {
  return flowsOf(net.g, net.gAmbient, T, air, f);
}

/**
 * Solves E − c·f(T(E), air) = rhs for E (starting from ws.E) by Newton's method with the tridiagonal
 * Jacobian I + c·K·diag(dT/dE), which is column diagonally dominant, so the Thomas algorithm needs
 * no pivoting. Returns false if it does not converge.
 */
function implicitSolve(net: ChainNetwork, ws: Workspace, c: number, air: number): boolean {
  const { n, E, T, rhs, f, D, lo, di, up, r } = ws;
  const g = net.g;
  for (let it = 0; it < MAX_NEWTON; it++) {
    temperatures(net, E, T);
    flows(net, T, air, f);
    let scale = 0;
    for (let i = 0; i < n; i++) {
      r[i] = -(E[i]! - c * f[i]! - rhs[i]!);
      const curve = net.curves[i]!;
      const slope = curve.constantSlope === curve.constantSlope ? curve.constantSlope : curve.slopeAt(E[i]! / net.mass[i]!);
      D[i] = slope / net.mass[i]!;
      scale = Math.max(scale, Math.abs(E[i]!));
    }
    for (let i = 0; i < n; i++) {
      const gl = i > 0 ? g[i - 1]! : net.gAmbient;
      const gr = i < n - 1 ? g[i]! : 0;
      di[i] = 1 + c * (gl + gr) * D[i]!;
      lo[i] = i > 0 ? -c * gl * D[i - 1]! : 0;
      up[i] = i < n - 1 ? -c * gr * D[i + 1]! : 0;
    }
    // Thomas algorithm, in place.
    for (let i = 1; i < n; i++) {
      const m = lo[i]! / di[i - 1]!;
      di[i] = di[i]! - m * up[i - 1]!;
      r[i] = r[i]! - m * r[i - 1]!;
    }
    r[n - 1] = r[n - 1]! / di[n - 1]!;
    for (let i = n - 2; i >= 0; i--) r[i] = (r[i]! - up[i]! * r[i + 1]!) / di[i]!;
    let maxStep = 0;
    for (let i = 0; i < n; i++) {
      E[i] = E[i]! + r[i]!;
      maxStep = Math.max(maxStep, Math.abs(r[i]!));
    }
    if (net.linear || maxStep <= 1e-12 * (scale + 1)) return true;
  }
  return false;
}

/** One TR-BDF2 step of length dt from time t (air linear from airA to airB over the step). Returns heat in, J, or NaN on failure. */
function trbdf2Step(net: ChainNetwork, ws: Workspace, dt: number, airA: number, airB: number): number {
  const { n, E, T, Es, rhs, f, save } = ws;
  save.set(E);
  temperatures(net, E, T);
  const qb0 = flows(net, T, airA, f);
  const c1 = (GAMMA * dt) / 2;
  for (let i = 0; i < n; i++) rhs[i] = E[i]! + c1 * f[i]!;
  const airMid = airA + GAMMA * (airB - airA);
  if (!implicitSolve(net, ws, c1, airMid)) {
    E.set(save);
    return Number.NaN;
  }
  temperatures(net, E, T);
  const qbMid = net.gAmbient * (airMid - T[0]!);
  const q1 = c1 * (qb0 + qbMid);
  Es.set(E);
  for (let i = 0; i < n; i++) rhs[i] = A2 * Es[i]! - B2 * save[i]!;
  if (!implicitSolve(net, ws, W2 * dt, airB)) {
    E.set(save);
    return Number.NaN;
  }
  temperatures(net, E, T);
  const qbEnd = net.gAmbient * (airB - T[0]!);
  return A2 * q1 + W2 * dt * qbEnd;
}

/**
 * The same TR-BDF2 scheme for a linear chain (constant capacities C and conductances), written in
 * temperatures: each stage solves (C + c·K)·T = rhs, and the tridiagonal factors of C + c·K are kept
 * per stage coefficient c, so a step costs two back-substitutions. Same results as the general path
 * to round-off; much faster on long traces.
 */
class LinearStepper {
  private readonly factors = new Map<number, { di: Float64Array; m: Float64Array }>();
  private readonly f: Float64Array;
  private readonly rhs: Float64Array;
  private readonly Tn: Float64Array;
  constructor(
    private readonly cap: Float64Array,
    private readonly g: Float64Array,
    private readonly gAmb: number,
  ) {
    const n = cap.length;
    this.f = new Float64Array(n);
    this.rhs = new Float64Array(n);
    this.Tn = new Float64Array(n);
  }

  private factor(c: number) {
    let fac = this.factors.get(c);
    if (fac) return fac;
    const n = this.cap.length, g = this.g;
    const di = new Float64Array(n), m = new Float64Array(n);
    for (let i = 0; i < n; i++) di[i] = this.cap[i]! + c * ((i > 0 ? g[i - 1]! : this.gAmb) + (i < n - 1 ? g[i]! : 0));
    for (let i = 1; i < n; i++) {
      m[i] = (-c * g[i - 1]!) / di[i - 1]!;
      di[i] = di[i]! - m[i]! * (-c * g[i - 1]!);
    }
    fac = { di, m };
    this.factors.set(c, fac);
    return fac;
  }

  /** Solves (C + c·K)·T = rhs (+ c·gAmb·air on node 0) into T. */
  private solve(c: number, air: number, T: Float64Array): void {
    const { di, m } = this.factor(c);
    const n = T.length, g = this.g, r = this.rhs;
    r[0] = r[0]! + c * this.gAmb * air;
    for (let i = 1; i < n; i++) r[i] = r[i]! - m[i]! * r[i - 1]!;
    T[n - 1] = r[n - 1]! / di[n - 1]!;
    for (let i = n - 2; i >= 0; i--) T[i] = (r[i]! + c * g[i]! * T[i + 1]!) / di[i]!;
  }

  /** Advances T in place by dt; returns the heat that entered, J. */
  step(T: Float64Array, dt: number, airA: number, airB: number): number {
    const n = T.length, cap = this.cap, f = this.f, r = this.rhs, Tn = this.Tn;
    Tn.set(T);
    const c1 = (GAMMA * dt) / 2;
    const qb0 = flowsOf(this.g, this.gAmb, T, airA, f);
    for (let i = 0; i < n; i++) r[i] = cap[i]! * T[i]! + c1 * f[i]!;
    const airMid = airA + GAMMA * (airB - airA);
    this.solve(c1, airMid, T);
    const q1 = c1 * (qb0 + this.gAmb * (airMid - T[0]!));
    for (let i = 0; i < n; i++) r[i] = cap[i]! * (A2 * T[i]! - B2 * Tn[i]!);
    this.solve(W2 * dt, airB, T);
    return A2 * q1 + W2 * dt * this.gAmb * (airB - T[0]!);
  }
}

function flowsOf(g: Float64Array, gAmb: number, T: Float64Array, air: number, f: Float64Array): number {
  const n = T.length;
  const qb = gAmb * (air - T[0]!);
  f[0] = qb;
  for (let i = 1; i < n; i++) f[i] = 0;
  for (let i = 0; i < n - 1; i++) {
    const q = g[i]! * (T[i + 1]! - T[i]!);
    f[i] = f[i]! + q;
    f[i + 1] = f[i + 1]! - q;
  }
  return qb;
}

/** Equal substeps in interval k: the given count, else enough that none is longer than maxStep_s. */
function substepsIn(k: number, span: number, maxStep_s: number, substeps?: Int32Array): number {
  return substeps ? substeps[k - 1]! : Math.max(1, Math.ceil(span / maxStep_s - 1e-9));
}

function runLinear(net: ChainNetwork, t_s: Float64Array, air_C: Float64Array, initial_C: Float64Array, maxStep_s: number, substeps?: Int32Array): ChainRun {
  const n = net.mass.length;
  const cap = Float64Array.from(net.mass, (m, i) => m / net.curves[i]!.constantSlope);
  const stepper = new LinearStepper(cap, net.g, net.gAmbient);
  const T = Float64Array.from(initial_C);
  const out = new Float64Array(t_s.length * n);
  out.set(T, 0);
  const stored = () => T.reduce((s, x, i) => s + cap[i]! * x, 0);
  const storedStart_J = stored();
  let heatIn = 0;
  let steps = 0;
  for (let k = 1; k < t_s.length; k++) {
    const span = t_s[k]! - t_s[k - 1]!;
    const m = substepsIn(k, span, maxStep_s, substeps);
    const dt = span / m;
    const a0 = air_C[k - 1]!, a1 = air_C[k]!;
    for (let j = 0; j < m; j++) {
      heatIn += stepper.step(T, dt, a0 + ((a1 - a0) * j) / m, a0 + ((a1 - a0) * (j + 1)) / m);
      steps++;
    }
    out.set(T, k * n);
  }
  return { T: out, heatIn_J: heatIn, storedStart_J, storedEnd_J: stored(), steps, endE_J: Float64Array.from(T, (x, i) => cap[i]! * x) };
}

/**
 * Integrates the network through the samples with internal steps no longer than maxStep_s (or exactly
 * `substeps[k]` equal steps in interval k, when given), the air linear between samples. A step whose Newton iteration fails is split in two (up to 2⁻¹⁰ of it).
 */
export function runChain(net: ChainNetwork, t_s: Float64Array, air_C: Float64Array, initial_C: Float64Array, maxStep_s: number, substeps?: Int32Array, initialE_J?: Float64Array): ChainRun {
  if (net.linear && !net.updateConductances && net.curves.every((c) => Number.isFinite(c.constantSlope))) {
    return runLinear(net, t_s, air_C, initial_C, maxStep_s, substeps);
  }
  const n = net.mass.length;
  const ns = t_s.length;
  const ws = new Workspace(n);
  // an initial enthalpy, when given, can lie inside a melting plateau (a partly melted coolant)
  for (let i = 0; i < n; i++) ws.E[i] = initialE_J ? initialE_J[i]! : net.mass[i]! * net.curves[i]!.hAt(initial_C[i]!);
  const out = new Float64Array(ns * n);
  temperatures(net, ws.E, ws.T);
  out.set(ws.T, 0);
  const stored = () => ws.E.reduce((s, e) => s + e, 0);
  const storedStart_J = stored();
  let heatIn = 0;
  let steps = 0;

  const advance = (dt: number, a0: number, a1: number, depth: number): void => {
    if (net.updateConductances) {
      temperatures(net, ws.E, ws.T);
      net.updateConductances(ws.T, net.g);
    }
    const q = trbdf2Step(net, ws, dt, a0, a1);
    if (Number.isNaN(q)) {
      if (depth >= 10) throw new Error("the implicit solver did not converge, even on a step of 1/1024 of the interval");
      const am = (a0 + a1) / 2;
      advance(dt / 2, a0, am, depth + 1);
      advance(dt / 2, am, a1, depth + 1);
      return;
    }
    heatIn += q;
    steps++;
  };

  for (let k = 1; k < ns; k++) {
    const span = t_s[k]! - t_s[k - 1]!;
    const m = substepsIn(k, span, maxStep_s, substeps);
    const dt = span / m;
    const a0 = air_C[k - 1]!, a1 = air_C[k]!;
    for (let j = 0; j < m; j++) advance(dt, a0 + ((a1 - a0) * j) / m, a0 + ((a1 - a0) * (j + 1)) / m, 0);
    temperatures(net, ws.E, ws.T);
    out.set(ws.T, k * n);
  }
  return { T: out, heatIn_J: heatIn, storedStart_J, storedEnd_J: stored(), steps, endE_J: Float64Array.from(ws.E) };
}
