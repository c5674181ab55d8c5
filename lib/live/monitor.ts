import { bridgeGaps, DEFAULT_GAP_MULTIPLE, type TraceSeries } from "../trace/series";
import { makeStepper, predictionRange, type ModelChoice, type ModelStepper, type Pack, type Product, type StepperState } from "../thermal";
import { isThresholdRule, type LimitSet } from "../exposure/limits";
import { judgeRules } from "../review/runReview";

/** One reading as a monitor receives it: epoch seconds (UTC), air and optional product probe, °C. */
export interface LiveReading {
  t_s: number;
  air_C: number;
  probe_C?: number;
}

/** Readings may arrive late and out of order by up to this much behind the newest one (the issue's hour). */
export const LATE_WINDOW_S = 3600;

export interface LiveConfig {
  product: Product;
  pack?: Pack;
  limits: LimitSet;
  model: ModelChoice;
  /** pauses longer than this many median intervals are gaps, as in an import (default 3) */
  gapMultiple?: number;
  model_uncertainty_K?: number;
  /** how far behind the newest reading a late one is still taken, s (default LATE_WINDOW_S) */
  lateWindow_s?: number;
}

/** What happened to each offered reading, by its index in the offer. */
export type ReadingOutcome =
  | { index: number; status: "added" }
  | { index: number; status: "duplicate" }
  | { index: number; status: "conflict"; reason: string }
  | { index: number; status: "too-late"; reason: string };

export interface RuleRunning {
  id: string;
  channel: string;
  status_so_far: "pass" | "fail" | "inconclusive";
  /** time beyond the rule's threshold so far, min (rounded to 0.001 min as in a review) */
  cumulative_min: number;
  /** for a rule with a cumulative allowance: the allowance left, min (0 when used up) */
  remaining_min?: number;
  reason: string;
}

const round = (x: number, digits: number) => Number(x.toFixed(digits));

/**
 * The state of one live monitor: its readings in time order, the modelled channels at every reading, and the
 * model state at each reading inside the late window (checkpoints), so that a late or out-of-order reading
 * re-steps only from the first reading it affects. The model restarts from the first reading only when the
 * wider temperature range changes the model itself (choice, tau, freezing point), as a batch review over the
 * same readings would then differ from the start.
 */
export class LiveMonitor {
  readonly config: LiveConfig;
  readonly t_s: number[] = [];
  readonly air_C: number[] = [];
  /** NaN where a reading had no probe value */
  readonly probe_C: number[] = [];
  readonly core_C: number[] = [];
  readonly surface_C: number[] = [];
  readonly mean_C: number[] = [];
  /** model state at each reading; null once a reading is older than the late window behind the newest */
  private states: Array<StepperState | null> = [];
  private stepper: ModelStepper | null = null;
  private aMin = Infinity;
  private aMax = -Infinity;
  /** readings re-stepped by the last `add` (a measure of the incremental work) */
  lastRestepped = 0;

  constructor(config: LiveConfig) {
    this.config = config;
  }

  get length(): number {
    return this.t_s.length;
  }

  get model(): ModelStepper | null {
    return this.stepper;
  }

  /** The state after the last reading (null before the first). */
  get lastState(): StepperState | null {
    return this.states[this.states.length - 1] ?? null;
  }

  /** What `add` would do with these readings, without changing anything (a service checks before it stores). */
  classify(readings: readonly LiveReading[]): ReadingOutcome[] {
    return this.sortIn(readings, [...this.t_s], [...this.air_C], [...this.probe_C]).outcomes;
  }

  /** Offers readings (any order). Equal repeats are ignored, different values at a stored time and readings older than the late window are refused; the rest are added and the model re-stepped from the first affected reading. */
  add(readings: readonly LiveReading[]): ReadingOutcome[] {
    const { outcomes, inserted } = this.sortIn(readings, this.t_s, this.air_C, this.probe_C);
    if (inserted.length === 0) return outcomes;
    let firstAffected = Infinity;
    for (const at of [...inserted].sort((a, b) => a - b)) {
      // final positions, in ascending order: each placeholder lands where its reading is
      this.core_C.splice(at, 0, NaN);
      this.surface_C.splice(at, 0, NaN);
      this.mean_C.splice(at, 0, NaN);
      this.states.splice(at, 0, null);
      firstAffected = Math.min(firstAffected, at);
    }
    for (const at of inserted) {
      this.aMin = Math.min(this.aMin, this.air_C[at]!);
      this.aMax = Math.max(this.aMax, this.air_C[at]!);
    }
    this.restep(firstAffected);
    return outcomes;
  }

  /** Inserts the acceptable readings into the given arrays in time order; returns each offer's outcome and the insertion positions, in insertion order. */
  private sortIn(readings: readonly LiveReading[], t_s: number[], air_C: number[], probe_C: number[]): { outcomes: ReadingOutcome[]; inserted: number[] } {
    const window = this.config.lateWindow_s ?? LATE_WINDOW_S;
    const order = readings.map((_, i) => i).sort((a, b) => readings[a]!.t_s - readings[b]!.t_s || a - b);
    const outcomes: ReadingOutcome[] = new Array(readings.length);
    const inserted: number[] = [];
    for (const i of order) {
      const r = readings[i]!;
      if (!Number.isFinite(r.t_s) || !Number.isFinite(r.air_C) || (r.probe_C !== undefined && !Number.isFinite(r.probe_C))) throw new RangeError(`reading ${i}: time and temperatures must be finite numbers`);
      const at = lowerBound(t_s, r.t_s);
      if (at < t_s.length && t_s[at] === r.t_s) {
        const sameProbe = r.probe_C === undefined ? Number.isNaN(probe_C[at]!) : r.probe_C === probe_C[at];
        outcomes[i] = air_C[at] === r.air_C && sameProbe
          ? { index: i, status: "duplicate" }
          : { index: i, status: "conflict", reason: `a reading at this time is already stored with air ${air_C[at]} °C${Number.isNaN(probe_C[at]!) ? "" : `, probe ${probe_C[at]} °C`}; stored readings are not replaced` };
        continue;
      }
      const newest = t_s[t_s.length - 1];
      if (newest !== undefined && r.t_s < newest - window) {
        outcomes[i] = { index: i, status: "too-late", reason: `the reading is ${((newest - r.t_s) / 60).toFixed(1)} min older than the newest one; late readings are taken up to ${window / 60} min behind it` };
        continue;
      }
      t_s.splice(at, 0, r.t_s);
      air_C.splice(at, 0, r.air_C);
      probe_C.splice(at, 0, r.probe_C ?? NaN);
      // earlier insertions at or after this position have moved one place on
      for (let j = 0; j < inserted.length; j++) if (inserted[j]! >= at) inserted[j]!++;
      inserted.push(at);
      outcomes[i] = { index: i, status: "added" };
    }
    return { outcomes, inserted };
  }

  private lowerBound(t: number): number {
    return lowerBound(this.t_s, t);
  }

  /** The model for the readings' temperature range (radiation, when the pack has it, at the first reading's air and the initial temperature). */
  private stepperFor(): ModelStepper {
    const { product, pack, model } = this.config;
    const { range, tMean_C } = predictionRange(product, pack, this.aMin, this.aMax, this.air_C[0]!);
    return makeStepper(product, pack, model, range, tMean_C, this.air_C[0]!);
  }

  private restep(from: number): void {
    const next = this.stepperFor();
    let start = from;
    if (!this.stepper || next.key !== this.stepper.key || from === 0) {
      this.stepper = next;
      start = 0;
    }
    const s = this.stepper;
    let state: StepperState = start === 0 ? s.start(this.t_s[0]!, this.air_C[0]!) : this.states[start - 1]!;
    if (!state) throw new Error("internal: no checkpoint before a late reading inside the window");
    if (start === 0) this.store(0, state);
    for (let k = Math.max(1, start); k < this.t_s.length; k++) {
      state = s.advance(state, this.t_s[k]!, this.air_C[k]!, k);
      this.store(k, state);
    }
    this.lastRestepped = this.t_s.length - start;
    this.prune();
  }

  private store(k: number, state: StepperState): void {
    const v = this.stepper!.read(state);
    this.states[k] = state;
    this.core_C[k] = v.core;
    this.surface_C[k] = v.surface;
    this.mean_C[k] = v.mean;
  }

  /** Network states outside the late window are dropped (an exact lumped state is one number and is kept). */
  private prune(): void {
    if (this.stepper?.path === "exact") return;
    const window = this.config.lateWindow_s ?? LATE_WINDOW_S;
    const oldest = this.t_s[this.t_s.length - 1]! - window;
    // keep the checkpoint just before the window too: a late reading re-steps from it
    for (let k = this.lowerBound(oldest) - 2; k >= 0 && this.states[k] !== null; k--) this.states[k] = null;
  }

  /** The readings as a trace series (what closing the monitor stores). */
  series(): TraceSeries {
    const hasProbe = this.probe_C.some((v) => !Number.isNaN(v));
    return { t_s: Float64Array.from(this.t_s), air_C: Float64Array.from(this.air_C), ...(hasProbe ? { probe_C: Float64Array.from(this.probe_C) } : {}) };
  }

  /** Every rule judged over the readings so far, exactly as a review of the same readings judges it. */
  rules(): RuleRunning[] {
    if (!this.stepper || this.length === 0) return [];
    const series = this.series();
    const pred = { core: Float64Array.from(this.core_C), surface: Float64Array.from(this.surface_C), mean: Float64Array.from(this.mean_C) };
    const { findings } = judgeRules(series, bridgeGaps(series), pred, this.stepper.screening.tau_s, this.config.limits, {}, this.config.model_uncertainty_K ?? 0, this.config.gapMultiple ?? DEFAULT_GAP_MULTIPLE);
    return findings.map((f) => {
      const found = this.config.limits.rules.find((r) => r.id === f.id)!;
      const allowance_min = isThresholdRule(found) ? found.max_cumulative_min : undefined;
      const cumulative_min = round(f.cumulative_s / 60, 3);
      return {
        id: f.id,
        channel: f.channel,
        status_so_far: f.status,
        cumulative_min,
        ...(allowance_min !== undefined ? { remaining_min: round(Math.max(0, allowance_min - f.cumulative_s / 60), 3) } : {}),
        reason: f.reason,
      };
    });
  }
}

function lowerBound(a: readonly number[], t: number): number {
  let lo = 0, hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (a[mid]! < t) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
