// Background runs of the engine for the web server: a review request is checked and loaded here, its
// computation goes to the worker pool, and its state (progress, outcome) is kept in this process so the
// page that started it can follow it and cancel it. A cancelled run stores nothing but an audit entry.
// Runs live in this server process: a restart forgets running ones (they had stored nothing).
import { randomUUID } from "node:crypto";
import type { ReviewInput } from "../review";
import { logRunCancelled } from "../db/runs";
import { runReviewInPool } from "./enginePool";
import { prepareReview, storeReview, type RunReviewRequest } from "./reviews";

export interface RunState {
  id: string;
  kind: "review" | "shipment";
  title: string;
  /** a shipment run: the shipment, and how many of its logger × product reviews are done of how many */
  shipmentId?: string;
  done?: number;
  total?: number;
  status: "running" | "done" | "failed" | "cancelled";
  /** fraction of the Monte Carlo samples done (0 to 1); 0 for a run without Monte Carlo until it ends */
  progress: number;
  /** the stored review, once done */
  reviewId?: string;
  /** why it failed */
  message?: string;
  started_at: string;
  finished_at?: string;
}

interface Run extends RunState {
  controller: AbortController;
  finished: Promise<void>;
}

const globalForRuns = globalThis as unknown as { corelagRuns?: Map<string, Run> };
const runs: Map<string, Run> = (globalForRuns.corelagRuns ??= new Map());

/**
 * The most work one web request may start, in model-sample steps: trace samples × (1 + Monte Carlo
 * samples), weighted ×100 when the model may be conduction (40 shells and Newton iterations cost about a
 * hundred lumped steps). 5×10⁸ is about two minutes of one core here.
 */
export const SERVER_RUN_CAP_STEPS = 5e8;

export function runCostSteps(input: ReviewInput): number {
  const samples = input.series.t_s.length;
  const mc = input.options?.uncertainty?.samples ?? 0;
  const model = input.options?.model ?? "auto";
  const mayConduct = model === "conduction" || model === "conduction-1d" || (model === "auto" && input.product.shape !== undefined);
  return samples * (1 + mc) * (mayConduct ? 100 : 1);
}

function publicState(r: Run): RunState {
  const { controller: _c, finished: _f, ...state } = r;
  return state;
}

export type StartRunOutcome = { ok: true; run: RunState } | { ok: false; field: string; message: string };

/** Checks and loads the request, then starts the computation in the pool; returns at once. */
export async function startReviewRun(request: RunReviewRequest, actor: string): Promise<StartRunOutcome> {
  const ready = await prepareReview(request);
  if (!ready.ok) return ready;
  const p = ready.prepared;
  const cost = runCostSteps(p.input);
  if (cost > SERVER_RUN_CAP_STEPS) {
    return {
      ok: false,
      field: p.input.options?.uncertainty ? "uncertainty" : "form",
      message:
        `this run would take about ${cost.toExponential(1)} model steps (trace samples × (1 + Monte Carlo samples)${p.input.product.shape ? " × 100 for conduction" : ""}); ` +
        `the server runs at most ${SERVER_RUN_CAP_STEPS.toExponential(0)} per request. Use fewer Monte Carlo samples, or run the study from the command line: ` +
        `npm run -s corelag -- review --trace FILE --product P.json --limits L.json --uncertainty U.json`,
    };
  }
  forgetOldRuns();
  const controller = new AbortController();
  const run: Run = { id: randomUUID(), kind: "review", title: p.title, status: "running", progress: 0, started_at: new Date().toISOString(), controller, finished: Promise.resolve() };
  runs.set(run.id, run);
  const end = (status: RunState["status"], extra: Partial<RunState> = {}) => Object.assign(run, { status, finished_at: new Date().toISOString() }, extra);
  run.finished = (async () => {
    try {
      const attempt = await runReviewInPool(p.input, { signal: controller.signal, onProgress: (f) => (run.progress = f) });
      if (controller.signal.aborted) throw controller.signal.reason;
      if (!attempt.ok) return void end("failed", { message: attempt.message });
      end("done", { progress: 1, reviewId: await storeReview(p, attempt.computation, actor) });
    } catch (e) {
      if (!controller.signal.aborted) return void end("failed", { message: e instanceof Error ? e.message : String(e) });
      await logRunCancelled(run.id, actor, { kind: run.kind, title: run.title, progress: Number(run.progress.toFixed(3)), requested_at: run.started_at });
      end("cancelled");
    }
  })();
  return { ok: true, run: publicState(run) };
}

/** What a shipment run's job gets: the abort signal and a way to report progress. */
export interface RunContext {
  signal: AbortSignal;
  setProgress: (done: number, total: number) => void;
}

/**
 * Starts a shipment review in the background: `job` runs each logger × product review in the pool (so a
 * cancel ends its worker) and stores the results at the end; the run is followed like a review run.
 */
export function startShipmentRun(shipmentId: string, title: string, total: number, actor: string, job: (ctx: RunContext) => Promise<{ ok: true } | { ok: false; message: string }>): RunState {
  forgetOldRuns();
  const controller = new AbortController();
  const run: Run = { id: randomUUID(), kind: "shipment", title, shipmentId, done: 0, total, status: "running", progress: 0, started_at: new Date().toISOString(), controller, finished: Promise.resolve() };
  runs.set(run.id, run);
  const end = (status: RunState["status"], extra: Partial<RunState> = {}) => Object.assign(run, { status, finished_at: new Date().toISOString() }, extra);
  run.finished = (async () => {
    try {
      const r = await job({ signal: controller.signal, setProgress: (done, n) => Object.assign(run, { done, total: n, progress: n > 0 ? done / n : 0 }) });
      if (controller.signal.aborted) throw controller.signal.reason;
      if (!r.ok) return void end("failed", { message: r.message });
      end("done", { progress: 1 });
    } catch (e) {
      if (!controller.signal.aborted) return void end("failed", { message: e instanceof Error ? e.message : String(e) });
      await logRunCancelled(run.id, actor, { kind: run.kind, title: run.title, progress: Number(run.progress.toFixed(3)), requested_at: run.started_at });
      end("cancelled");
    }
  })();
  return publicState(run);
}

/** Finished runs are kept for an hour, for the page that follows them. */
function forgetOldRuns(now = Date.now()): void {
  for (const [id, r] of runs) if (r.finished_at && now - Date.parse(r.finished_at) > 3_600_000) runs.delete(id);
}

export function getRun(id: string): RunState | undefined {
  const r = runs.get(id);
  return r && publicState(r);
}

/** Waits until the run ends or `ms` pass, whichever is first. */
export async function waitForRun(id: string, ms: number): Promise<RunState | undefined> {
  const r = runs.get(id);
  if (!r) return undefined;
  let timer: NodeJS.Timeout | undefined;
  await Promise.race([r.finished, new Promise<void>((resolve) => (timer = setTimeout(resolve, ms)))]);
  clearTimeout(timer);
  return publicState(r);
}

export type CancelOutcome = { ok: true; run: RunState } | { ok: false; reason: "not-found" | "not-running"; run?: RunState };

/** Cancels a running run: its worker ends, nothing is stored, and an audit entry says so. */
export async function cancelRun(id: string): Promise<CancelOutcome> {
  const r = runs.get(id);
  if (!r) return { ok: false, reason: "not-found" };
  if (r.status !== "running") return { ok: false, reason: "not-running", run: publicState(r) };
  r.controller.abort(new Error("cancelled by the user"));
  await r.finished;
  return { ok: true, run: publicState(r) };
}
