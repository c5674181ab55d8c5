// The work a Monte Carlo study asks for, counted before it starts, and the most one request or one page
// may start: the server refuses a review over it (lib/services/runs.ts), the design page a study.

/**
 * The most work one web request (or one study on the design page) may start, in model-sample steps:
 * trace samples × (1 + Monte Carlo samples), weighted ×100 when the model may be conduction (40 shells
 * and Newton iterations cost about a hundred lumped steps). 5×10⁸ is about two minutes of one core here.
 */
export const STUDY_CAP_STEPS = 5e8;

/** Whether the model chosen may be a conduction model (explicitly, or auto with a shaped product). */
export function mayConduct(model: string | undefined, product: { shape?: unknown }): boolean {
  const m = model ?? "auto";
  return m === "conduction" || m === "conduction-1d" || (m === "auto" && product.shape !== undefined);
}

/** Model-sample steps of a run: trace samples × (1 + Monte Carlo samples), ×100 when it may be conduction. */
export function studyCostSteps(traceSamples: number, monteCarloSamples: number, conduction: boolean): number {
  return traceSamples * (1 + monteCarloSamples) * (conduction ? 100 : 1);
}

/** The refusal of a study over the cap, naming the cap and the command line for bigger studies; null when within it. */
export function overCapMessage(cost: number, conduction: boolean, where: "the server runs" | "this page runs"): string | null {
  if (cost <= STUDY_CAP_STEPS) return null;
  return (
    `this run would take about ${cost.toExponential(1)} model steps (trace samples × (1 + Monte Carlo samples)${conduction ? " × 100 for conduction" : ""}); ` +
    `${where} at most ${STUDY_CAP_STEPS.toExponential(0)} per request. Use fewer Monte Carlo samples, or run the study from the command line: ` +
    `npm run -s corelag -- review --trace FILE --product P.json --limits L.json --uncertainty U.json`
  );
}
