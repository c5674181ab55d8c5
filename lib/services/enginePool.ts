// The engine's worker-thread pool (piscina): review runs from the web server are computed here, so the
// request thread keeps answering while a long Monte Carlo runs. Sized to the machine's cores minus one
// (at least one). The worker is a prebuilt bundle (dist/worker/reviewWorker.mjs, made with the CLI's
// bundle by scripts/build-cli.mjs), because the server's own bundle cannot be loaded by a worker.
import { existsSync } from "node:fs";
import { availableParallelism } from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { MessageChannel } from "node:worker_threads";
import Piscina from "piscina";
import type { ReviewAttempt, ReviewInput } from "../review";
import type { CalibrationAttempt, CalibrationTask } from "./workers/reviewWorker";

const globalForPool = globalThis as unknown as { corelagEnginePool?: Piscina };

export function engineThreads(): number {
  return Math.max(1, availableParallelism() - 1);
}

function workerFile(): string {
  const file = path.resolve(process.cwd(), "dist", "worker", "reviewWorker.mjs");
  if (!existsSync(file)) throw new Error(`the engine worker is not built (${file} is missing): run npm run build`);
  return file;
}

function pool(): Piscina {
  globalForPool.corelagEnginePool ??= new Piscina({
    filename: pathToFileURL(workerFile()).href,
    maxThreads: engineThreads(),
    minThreads: 0,
    idleTimeout: 60_000,
  });
  return globalForPool.corelagEnginePool;
}

/** Runs one review computation in the pool. Aborting `signal` ends the worker thread (piscina). */
export async function runReviewInPool(input: ReviewInput, opts: { signal?: AbortSignal; onProgress?: (fraction: number) => void } = {}): Promise<ReviewAttempt> {
  const { port1, port2 } = new MessageChannel();
  port1.on("message", (fraction: number) => opts.onProgress?.(fraction));
  try {
    return (await pool().run({ input, progress: port2 }, { transferList: [port2], signal: opts.signal })) as ReviewAttempt;
  } finally {
    port1.close();
  }
}

/** Runs one calibration fit in the pool. */
export async function calibrateInPool(task: CalibrationTask): Promise<CalibrationAttempt> {
  return (await pool().run(task, { name: "calibrate" })) as CalibrationAttempt;
}

/** Ends every worker (on shutdown, and in tests). */
export async function closeEnginePool(): Promise<void> {
  const p = globalForPool.corelagEnginePool;
  globalForPool.corelagEnginePool = undefined;
  await p?.destroy();
}
