// Background runs of the engine for the web server, of two kinds: a review (one request, checked and loaded
// here) and a shipment review (every logger × product review of a shipment, lib/services/shipments.ts). The
// computation goes to the worker pool, and the state (progress, outcome) is kept so the page that started it
// can follow it and cancel it. A cancelled run stores nothing but an audit entry.
// On SQLite, runs live in this server process: a restart forgets running ones (they had stored nothing).
// On PostgreSQL a run is a job in the database's queue (lib/db/jobQueue.ts, pg-boss): any instance's workers
// pick it up (computed in that instance's pool), every instance reports its state, and a run whose instance
// died is taken up again once it expires. A queued run stores under its job's id (a review's id, a shipment
// run's id), so a retry after the store committed finds it instead of storing twice.
import { randomUUID } from "node:crypto";
import { mayConduct, overCapMessage, STUDY_CAP_STEPS, studyCostSteps } from "../uncertainty/cost";
import type { ReviewInput } from "../review";
import { logRunCancelled } from "../db/runs";
import { dbKind } from "../db/client";
import { reviewExists } from "../db/reviews";
import { engineThreads, runReviewInPool } from "./enginePool";
import { prepareReview, storeReview, type RunReviewRequest } from "./reviews";
import type { Actor } from "../access/actor";

const REVIEW_QUEUE = "review-run";
interface ReviewJobData {
  request: RunReviewRequest;
  actor: Actor;
  title: string;
  requested_at: string;
}
type ReviewJobOutput = { reviewId: string } | { failed: string } | { cancelled: true };

const SHIPMENT_QUEUE = "shipment-run";
interface ShipmentJobData {
  shipmentId: string;
  actor: Actor;
  title: string;
  total: number;
  requested_at: string;
}
type ShipmentJobOutput = { done: number; total: number } | { failed: string } | { cancelled: true };

const queued = () => dbKind() === "postgres";
const queue = () => import("../db/jobQueue");
// shipments.ts starts its runs through this module; its computation is imported when a run starts
const shipmentWork = async () => (await import("./shipments")).computeShipmentRun;
/** The review id a queued run stores under: its job id without dashes (the form of every review id). */
const reviewIdOfJob = (jobId: string) => jobId.replace(/-/g, "");

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
  /** who cancelled it, for the audit entry */
  cancelledBy?: Actor;
  finished: Promise<void>;
}

const globalForRuns = globalThis as unknown as { corelagRuns?: Map<string, Run> };
const runs: Map<string, Run> = (globalForRuns.corelagRuns ??= new Map());

/** The most work one web request may start (lib/uncertainty/cost.ts). */
export const SERVER_RUN_CAP_STEPS = STUDY_CAP_STEPS;

export function runCostSteps(input: ReviewInput): number {
  return studyCostSteps(input.series.t_s.length, input.options?.uncertainty?.samples ?? 0, mayConduct(input.options?.model, input.product));
}

function publicState(r: Run): RunState {
  const { controller: _c, finished: _f, cancelledBy: _b, ...state } = r;
  return state;
}

export type StartRunOutcome = { ok: true; run: RunState } | { ok: false; field: string; message: string };

/** Checks and loads the request, then starts the computation in the pool; returns at once. */
export async function startReviewRun(request: RunReviewRequest, actor: Actor): Promise<StartRunOutcome> {
  const ready = await prepareReview(request);
  if (!ready.ok) return ready;
  const p = ready.prepared;
  const cost = runCostSteps(p.input);
  const refusal = overCapMessage(cost, mayConduct(p.input.options?.model, p.input.product), "the server runs");
  if (refusal) return { ok: false, field: p.input.options?.uncertainty ? "uncertainty" : "form", message: refusal };
  forgetOldRuns();
  if (queued()) {
    const requested_at = new Date().toISOString();
    const data: ReviewJobData = { request, actor, title: p.title, requested_at };
    const id = await (await queue()).enqueueJob(REVIEW_QUEUE, data);
    return { ok: true, run: { id, kind: "review", title: p.title, status: "running", progress: 0, started_at: requested_at } };
  }
  return {
    ok: true,
    run: startLocalRun({ id: randomUUID(), kind: "review", title: p.title, started_at: new Date().toISOString() }, actor, async (run) => {
      const signal = run.controller.signal;
      const attempt = await runReviewInPool(p.input, { signal, onProgress: (f) => (run.progress = f) });
      if (signal.aborted) throw signal.reason;
      if (!attempt.ok) return { ok: false, message: attempt.message };
      return { ok: true, extra: { reviewId: await storeReview(p, attempt.computation, actor) } };
    }),
  };
}

/**
 * Runs `work` in this process as a run the page can follow and cancel: its end (done with `extra`, failed with
 * the message) is kept on the run; a cancel stores nothing and is audited under whoever cancelled it.
 */
function startLocalRun(
  base: Pick<RunState, "id" | "kind" | "title" | "started_at" | "shipmentId" | "done" | "total">,
  actor: Actor,
  work: (run: Run) => Promise<{ ok: true; extra?: Partial<RunState> } | { ok: false; message: string }>,
): RunState {
  const controller = new AbortController();
  const run: Run = { ...base, status: "running", progress: 0, controller, finished: Promise.resolve() };
  runs.set(run.id, run);
  const end = (status: RunState["status"], extra: Partial<RunState> = {}) => Object.assign(run, { status, finished_at: new Date().toISOString() }, extra);
  run.finished = (async () => {
    try {
      const r = await work(run);
      if (controller.signal.aborted) throw controller.signal.reason;
      if (!r.ok) return void end("failed", { message: r.message });
      end("done", { progress: 1, ...r.extra });
    } catch (e) {
      if (!controller.signal.aborted) return void end("failed", { message: e instanceof Error ? e.message : String(e) });
      await logRunCancelled(run.id, run.cancelledBy ?? actor, { kind: run.kind, title: run.title, progress: Number(run.progress.toFixed(3)), requested_at: run.started_at });
      end("cancelled");
    }
  })();
  return publicState(run);
}

/** What a shipment run's job gets: the abort signal and a way to report progress. */
export interface RunContext {
  signal: AbortSignal;
  setProgress: (done: number, total: number) => void;
}

/**
 * Starts a shipment review run in the background (the shipment's plan was checked by the caller): in this
 * process on SQLite, a job in the queue on PostgreSQL. The run's id is the id its reviews are stored under.
 */
export async function startShipmentRun(shipmentId: string, title: string, total: number, actor: Actor): Promise<RunState> {
  forgetOldRuns();
  const requested_at = new Date().toISOString();
  if (queued()) {
    const data: ShipmentJobData = { shipmentId, actor, title, total, requested_at };
    const id = await (await queue()).enqueueJob(SHIPMENT_QUEUE, data);
    return { id, kind: "shipment", title, shipmentId, done: 0, total, status: "running", progress: 0, started_at: requested_at };
  }
  const work = await shipmentWork();
  const id = randomUUID();
  return startLocalRun({ id, kind: "shipment", title, shipmentId, done: 0, total, started_at: requested_at }, actor, (run) =>
    work(shipmentId, id, actor, { signal: run.controller.signal, setProgress: shipmentProgress(run) }),
  );
}

const shipmentProgress = (run: Run) => (done: number, total: number) => Object.assign(run, { done, total, progress: total > 0 ? done / total : 0 });

/** Finished runs are kept for an hour, for the page that follows them. */
function forgetOldRuns(now = Date.now()): void {
  for (const [id, r] of runs) if (r.finished_at && now - Date.parse(r.finished_at) > 3_600_000) runs.delete(id);
}

/** A queued run's job, in whichever queue holds it (job ids are UUIDs, unique across queues). */
async function findJob(id: string) {
  const q = await queue();
  const review = await q.getJob<ReviewJobData>(REVIEW_QUEUE, id);
  if (review) return { kind: "review" as const, queue: REVIEW_QUEUE, job: review };
  const shipment = await q.getJob<ShipmentJobData>(SHIPMENT_QUEUE, id);
  return shipment ? { kind: "shipment" as const, queue: SHIPMENT_QUEUE, job: shipment } : null;
}

export async function getRun(id: string): Promise<RunState | undefined> {
  const r = runs.get(id);
  if (!queued()) return r && publicState(r);
  const found = await findJob(id);
  if (!found) return undefined;
  const { job } = found;
  const base: RunState =
    found.kind === "review"
      ? { id, kind: "review", title: job.data.title, status: "running", progress: r?.progress ?? 0, started_at: job.data.requested_at }
      : { id, kind: "shipment", title: job.data.title, shipmentId: (job.data as ShipmentJobData).shipmentId, done: r?.done ?? 0, total: r?.total ?? (job.data as ShipmentJobData).total, status: "running", progress: r?.progress ?? 0, started_at: job.data.requested_at };
  const finished_at = (job.completedOn ?? new Date()).toISOString();
  const out = (job.output ?? {}) as Partial<{ reviewId: string; done: number; total: number; failed: string; cancelled: true; message: string }>;
  switch (job.state) {
    case "created":
    case "retry":
    case "active":
      return base;
    case "cancelled":
      return { ...base, status: "cancelled", finished_at };
    case "failed":
      return { ...base, status: "failed", finished_at, message: out.message ?? "the run failed on every attempt" };
    case "completed":
      if (out.reviewId) return { ...base, status: "done", progress: 1, reviewId: out.reviewId, finished_at };
      if (out.total !== undefined) return { ...base, status: "done", progress: 1, done: out.done, total: out.total, finished_at };
      if (out.failed) return { ...base, status: "failed", message: out.failed, finished_at };
      return { ...base, status: "cancelled", finished_at };
  }
}

/** Waits until the run ends or `ms` pass, whichever is first. */
export async function waitForRun(id: string, ms: number): Promise<RunState | undefined> {
  if (queued()) {
    const until = Date.now() + ms;
    for (;;) {
      const s = await getRun(id);
      if (!s || s.status !== "running" || Date.now() >= until) return s;
      await new Promise((res) => setTimeout(res, 200));
    }
  }
  const r = runs.get(id);
  if (!r) return undefined;
  let timer: NodeJS.Timeout | undefined;
  await Promise.race([r.finished, new Promise<void>((resolve) => (timer = setTimeout(resolve, ms)))]);
  clearTimeout(timer);
  return publicState(r);
}

export type CancelOutcome = { ok: true; run: RunState } | { ok: false; reason: "not-found" | "not-running"; run?: RunState };

/** Cancels a running run: its worker ends, nothing is stored, and an audit entry says so. */
export async function cancelRun(id: string, actor: Actor): Promise<CancelOutcome> {
  if (queued()) {
    const before = await getRun(id);
    if (!before) return { ok: false, reason: "not-found" };
    if (before.status !== "running") return { ok: false, reason: "not-running", run: before };
    const found = await findJob(id);
    if (!found) return { ok: false, reason: "not-found" };
    await (await queue()).cancelJob(found.queue, id);
    // a job no worker has started yet: nobody else will record the cancellation
    if (found.job.state === "created" || found.job.state === "retry") {
      await logRunCancelled(id, actor, { kind: found.kind, title: found.job.data.title, progress: 0, requested_at: found.job.data.requested_at });
    } else {
      // the worker running it notices within a second, ends its computation and records the cancellation
      for (let i = 0; i < 100 && runs.get(id)?.status === "running"; i++) await new Promise((res) => setTimeout(res, 100));
    }
    return { ok: true, run: (await getRun(id)) ?? { ...before, status: "cancelled" } };
  }
  const r = runs.get(id);
  if (!r) return { ok: false, reason: "not-found" };
  if (r.status !== "running") return { ok: false, reason: "not-running", run: publicState(r) };
  r.cancelledBy = actor;
  r.controller.abort(new Error("cancelled by the user"));
  await r.finished;
  return { ok: true, run: publicState(r) };
}

/**
 * One queued review run, in whichever instance picked it up: computed in this instance's pool (progress kept
 * here), stored under the job's id. An engine refusal completes the job as failed (no retry: it would refuse
 * again); a crash or an unexpected error lets pg-boss retry it.
 */
async function workReviewJob(job: { id: string; data: ReviewJobData }): Promise<ReviewJobOutput> {
  const reviewId = reviewIdOfJob(job.id);
  if (await reviewExists(reviewId)) return { reviewId }; // stored by an attempt that died before completing the job
  const ready = await prepareReview(job.data.request);
  if (!ready.ok) return { failed: ready.message };
  const p = ready.prepared;
  const controller = new AbortController();
  const run: Run = { id: job.id, kind: "review", title: p.title, status: "running", progress: 0, started_at: job.data.requested_at, controller, finished: Promise.resolve() };
  runs.set(job.id, run);
  const stopWatching = watchCancel(REVIEW_QUEUE, job.id, controller);
  const end = (status: RunState["status"], extra: Partial<RunState> = {}) => Object.assign(run, { status, finished_at: new Date().toISOString() }, extra);
  try {
    const attempt = await runReviewInPool(p.input, { signal: controller.signal, onProgress: (f) => (run.progress = f) });
    if (controller.signal.aborted) throw controller.signal.reason;
    if (!attempt.ok) {
      end("failed", { message: attempt.message });
      return { failed: attempt.message };
    }
    try {
      await storeReview(p, attempt.computation, job.data.actor, reviewId);
    } catch (e) {
      if (!(await reviewExists(reviewId))) throw e;
    }
    end("done", { progress: 1, reviewId });
    return { reviewId };
  } catch (e) {
    if (!controller.signal.aborted) {
      end("failed", { message: e instanceof Error ? e.message : String(e) });
      throw e;
    }
    await logRunCancelled(job.id, job.data.actor, { kind: "review", title: p.title, progress: Number(run.progress.toFixed(3)), requested_at: job.data.requested_at });
    end("cancelled");
    return { cancelled: true };
  } finally {
    stopWatching();
  }
}

/**
 * One queued shipment run, in whichever instance picked it up: computed in this instance's pool (progress kept
 * here), stored under the job's id. A refusal (a review that cannot run) completes the job as failed; a crash
 * or an unexpected error lets pg-boss retry it, and a retry after the store committed stores nothing again.
 */
async function workShipmentJob(job: { id: string; data: ShipmentJobData }): Promise<ShipmentJobOutput> {
  const { shipmentId, actor, title, total, requested_at } = job.data;
  const controller = new AbortController();
  const run: Run = { id: job.id, kind: "shipment", title, shipmentId, done: 0, total, status: "running", progress: 0, started_at: requested_at, controller, finished: Promise.resolve() };
  runs.set(job.id, run);
  const stopWatching = watchCancel(SHIPMENT_QUEUE, job.id, controller);
  const end = (status: RunState["status"], extra: Partial<RunState> = {}) => Object.assign(run, { status, finished_at: new Date().toISOString() }, extra);
  try {
    const r = await (await shipmentWork())(shipmentId, job.id, actor, { signal: controller.signal, setProgress: shipmentProgress(run) });
    if (controller.signal.aborted) throw controller.signal.reason;
    if (!r.ok) {
      end("failed", { message: r.message });
      return { failed: r.message };
    }
    end("done", { progress: 1 });
    return { done: run.done ?? total, total: run.total ?? total };
  } catch (e) {
    if (!controller.signal.aborted) {
      end("failed", { message: e instanceof Error ? e.message : String(e) });
      throw e;
    }
    await logRunCancelled(job.id, actor, { kind: "shipment", title, progress: Number(run.progress.toFixed(3)), requested_at });
    end("cancelled");
    return { cancelled: true };
  } finally {
    stopWatching();
  }
}

/** Aborts `controller` once the job is cancelled from any instance (looked up every second); returns the stop. */
function watchCancel(queueName: string, id: string, controller: AbortController): () => void {
  const watch = setInterval(() => {
    queue()
      .then((q) => q.getJob(queueName, id))
      .then(
        (j) => {
          if (j?.state === "cancelled") controller.abort(new Error("cancelled by the user"));
        },
        (e: unknown) => console.error(`corelag: watching run ${id} for a cancel:`, e),
      );
  }, 1000);
  return () => clearInterval(watch);
}

const globalForWorkers = globalThis as unknown as { corelagRunWorkers?: Promise<void> };

/** At server start (instrumentation.ts): on PostgreSQL, this instance takes queued review runs (two per engine thread) and shipment runs. */
export function startRunWorkers(): Promise<void> {
  if (!queued()) return Promise.resolve();
  // twice the engine threads: a worker fetches its next job (pg-boss polls every 0.5 s) while another computes;
  // the pool still computes at most engineThreads() at once and queues the rest
  // a shipment job already computes its reviews side by side in the pool: one worker per engine thread
  globalForWorkers.corelagRunWorkers ??= queue().then(async (q) => {
    await q.workJobs<ReviewJobData>(REVIEW_QUEUE, 2 * engineThreads(), workReviewJob);
    await q.workJobs<ShipmentJobData>(SHIPMENT_QUEUE, engineThreads(), workShipmentJob);
  });
  return globalForWorkers.corelagRunWorkers;
}
