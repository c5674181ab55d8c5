import type { ModelChoice, Pack, Product } from "./definitions";
import { resolveProduct } from "./resolve";
import { resistances } from "./resistances";
import { buildNetwork } from "./network";
import { buildGraph } from "./graphNetwork";
import { runChain } from "./solvers/chain";
import { runGraph } from "./solvers/graph";
import { lumpedStep } from "./lumped";
import { conductionKindFor, DEFAULT_SHELLS, gridFor, readChannels, screenDefinition, solverPath, type Range, type ScreeningResult, type SolverPath } from "./predict";

/**
 * A model that advances one reading at a time and can be continued from a stored state: what a live monitor
 * runs. It makes the same model choice as `predict` for the same temperature range, and steps with the same
 * solvers: the exact lumped update (bit for bit what `predict` gives on the same readings), or the chain or
 * graph network continued from its node enthalpies (bit for bit one solver run over the same readings with the
 * same internal steps). The network's internal steps are fixed per interval (`stepFor`), since the batch
 * review's step comes from halving over the whole trace, which a stream cannot know in advance.
 */
export interface StepperState {
  t_s: number;
  air_C: number;
  /** node temperatures, °C (the one lumped temperature for the exact update) */
  T: Float64Array;
  /** node enthalpies, J (null for the exact update) */
  E: Float64Array | null;
}

export interface ChannelValues {
  core: number;
  surface: number;
  mean: number;
  coolant: number | null;
}

export interface ModelStepper {
  path: SolverPath;
  screening: ScreeningResult;
  /** changes when a wider temperature range would change the model (choice, tau, freezing point): then restart */
  key: string;
  /** internal step of the network, s (null for the exact update) */
  step_s: number | null;
  start(t_s: number, air_C: number): StepperState;
  /** the state at t1 with the air linear from the state's air to air1; `index` is the interval's position (1 = first) */
  advance(state: StepperState, t1_s: number, air1_C: number, index: number): StepperState;
  read(state: StepperState): ChannelValues;
}

/** Internal steps per tau for the live network: a second-order scheme at tau/200 is well inside the 0.01 K of predict's halving. */
export const LIVE_STEPS_PER_TAU = 200;

/**
 * Equal TR-BDF2 steps in interval `index` of length span_s: no longer than step_s, and, as in predict's
 * halving, 16× and 4× finer in the first two intervals, where the start-up transient is.
 */
export function substepsFor(span_s: number, step_s: number, index: number): number {
  const m = Math.max(1, Math.ceil(span_s / step_s - 1e-9));
  return m * (index === 1 ? 16 : index === 2 ? 4 : 1);
}

export function makeStepper(product: Product, pack: Pack | undefined, model: ModelChoice, range: Range, tMean_C: number, air0_C: number): ModelStepper {
  const screening = screenDefinition(product, pack, model, tMean_C, range);
  const p = resolveProduct(product, range.lo_C);
  const kind = screening.conduction_kind ?? conductionKindFor(p, model);
  const path = solverPath(p, pack, screening.model, kind);
  const tau = screening.tau_s;
  const key = JSON.stringify([screening.model, kind, path, tau, p.freezing.freezing_point_C]);
  if (path === "exact") {
    const rate = 1 / tau;
    const read = (s: StepperState): ChannelValues => ({ core: s.T[0]!, surface: s.T[0]!, mean: s.T[0]!, coolant: null });
    return {
      path, screening, key, step_s: null, read,
      start: (t_s, air_C) => ({ t_s, air_C, T: Float64Array.of(product.initial_C), E: null }),
      advance: (s, t1, a1) => ({ t_s: t1, air_C: a1, T: Float64Array.of(lumpedStep(s.T[0]!, s.air_C, a1, (t1 - s.t_s) * rate)), E: null }),
    };
  }
  const step_s = Math.min(60, Math.max(0.5, tau / LIVE_STEPS_PER_TAU));
  const r = resistances(product, p.geometry, p.area_m2, pack, tMean_C);
  // the network is built on first use: a caller that only compares keys pays for the screening alone
  const once = <T>(make: () => T): (() => T) => {
    let v: T | undefined;
    return () => (v ??= make());
  };
  if (path === "chain") {
    const built = once(() => buildNetwork(p, pack, r, screening.model, DEFAULT_SHELLS));
    const net = once(() => ({ b: built(), n: built().net.mass.length }));
    return {
      path, screening, key, step_s,
      start: (t_s, air_C) => {
        const { b, n } = net();
        // the start's node temperatures as a run reports them (from the enthalpies, for a nonlinear chain)
        const run = runChain(b.net, Float64Array.of(t_s), Float64Array.of(air_C), b.initial_C, 1, new Int32Array(0), b.initialE_J);
        return { t_s, air_C, T: run.T.slice(0, n), E: Float64Array.from(b.initialE_J) };
      },
      advance: (s, t1, a1, index) => {
        const { b, n } = net();
        const run = runChain(b.net, Float64Array.of(s.t_s, t1), Float64Array.of(s.air_C, a1), s.T, 1, Int32Array.of(substepsFor(t1 - s.t_s, step_s, index)), s.E ?? undefined);
        return { t_s: t1, air_C: a1, T: run.T.slice(n), E: run.endE_J };
      },
      read: (s) => {
        const ch = readChannels(net().b, p, s.T, Float64Array.of(s.air_C), 1);
        return { core: ch.core[0]!, surface: ch.surface[0]!, mean: ch.mean[0]!, coolant: ch.coolant ? ch.coolant[0]! : null };
      },
    };
  }
  const graph = once(() => {
    const g = buildGraph(p, pack, r, gridFor(p, screening.model, kind, { model }), air0_C);
    return { g, n: g.net.mass.length };
  });
  return {
    path, screening, key, step_s,
    start: (t_s, air_C) => {
      const { g, n } = graph();
      const E = Float64Array.from(g.initialE);
      // the start's node temperatures as a run reports them (from the enthalpies)
      const run = runGraph(g.net, Float64Array.of(t_s), Float64Array.of(air_C), E, new Int32Array(0));
      return { t_s, air_C, T: run.T.slice(0, n), E };
    },
    advance: (s, t1, a1, index) => {
      const { g, n } = graph();
      const run = runGraph(g.net, Float64Array.of(s.t_s, t1), Float64Array.of(s.air_C, a1), s.E!, Int32Array.of(substepsFor(t1 - s.t_s, step_s, index)));
      return { t_s: t1, air_C: a1, T: run.T.slice(n), E: run.endE_J };
    },
    read: (s) => {
      const v = graph().g.read(s.T, s.air_C);
      return { core: v.core, surface: v.surface, mean: v.mean, coolant: v.coolant };
    },
  };
}
