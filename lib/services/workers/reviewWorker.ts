// Worker-thread entry of the engine pool (bundled to dist/worker/reviewWorker.mjs): runs a review's
// computation (the default task; Monte Carlo progress through a message port) or a calibration fit (the
// task named "calibrate") off the server's request thread.
import type { MessagePort } from "node:worker_threads";
import { tryRunReview, type ReviewAttempt, type ReviewInput } from "../../review";
import { calibrateLumped, type CalibrationOptions, type CalibrationResult } from "../../design/calibrate";
import type { Pack, Product } from "../../thermal/definitions";

export interface ReviewTask {
  input: ReviewInput;
  progress: MessagePort;
}

export default function runReviewTask({ input, progress }: ReviewTask): ReviewAttempt {
  let last = -1;
  const attempt = tryRunReview(input, {
    onProgress: (fraction) => {
      // At most about a hundred messages per run.
      if (fraction - last >= 0.01 || fraction === 1) {
        last = fraction;
        progress.postMessage(fraction);
      }
    },
  });
  progress.close();
  return attempt;
}

export interface CalibrationTask {
  t_s: Float64Array;
  air_C: Float64Array;
  probe_C: Float64Array;
  options: CalibrationOptions;
  definitions?: { product: Product; pack?: Pack };
}
export type CalibrationAttempt = { ok: true; result: CalibrationResult } | { ok: false; message: string };

/** A calibration fit, run as the pool task named "calibrate"; a fit that cannot be made comes back as a message. */
export function calibrate(task: CalibrationTask): CalibrationAttempt {
  try {
    return { ok: true, result: calibrateLumped(task.t_s, task.air_C, task.probe_C, task.options, task.definitions) };
  } catch (e) {
    return { ok: false, message: e instanceof Error ? e.message : String(e) };
  }
}
