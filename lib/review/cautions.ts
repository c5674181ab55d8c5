/** Shown with every outcome, on screen, in the CLI output and in exports. */
export const CAUTIONS: readonly string[] = [
  "Core temperatures are model estimates from the recorded air temperature, not measurements.",
  "The suggested outcome supports, and does not replace, the decision of the responsible food-safety professional; local regulations and your own food-safety plan govern.",
];
