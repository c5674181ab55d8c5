import { runReview, type ReviewComputation, type ReviewHooks, type ReviewInput } from "./runReview";

export type ReviewAttempt = { ok: true; computation: ReviewComputation } | { ok: false; message: string };

/**
 * runReview as a result, never a throw: the schemas keep every quantity in a plausible range, but a
 * combination of plausible values can still defeat the solver (no convergence, a curve that does not
 * increase). The caller reports that as a named failure with the engine's own words, and stores nothing.
 * A result with a non-finite predicted temperature is refused the same way rather than stored.
 */
export function tryRunReview(input: ReviewInput, hooks: ReviewHooks = {}): ReviewAttempt {
  let computation: ReviewComputation;
  try {
    computation = runReview(input, hooks);
  } catch (e) {
    return { ok: false, message: `the engine could not compute this review: ${e instanceof Error ? e.message : String(e)}` };
  }
  for (const [name, v] of [["core", computation.core_C], ["surface", computation.surface_C], ["mean", computation.mean_C]] as const) {
    const i = v.findIndex((x) => !Number.isFinite(x));
    if (i >= 0) return { ok: false, message: `the engine could not compute this review: the predicted ${name} temperature is not finite at sample ${i + 1}` };
  }
  return { ok: true, computation };
}
