// Worker-thread entry of the engine pool (bundled to dist/worker/reviewWorker.mjs): runs one review's
// computation off the server's request thread and reports Monte Carlo progress through a message port.
import type { MessagePort } from "node:worker_threads";
import { tryRunReview, type ReviewAttempt, type ReviewInput } from "../../review";

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
