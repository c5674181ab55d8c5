/**
 * Shown on every design page (sizing, uncertainty, calibration, profiles). The review's caution speaks of
 * recorded air and a suggested outcome, which a design has neither: a design is sized against a stated
 * ambient, so it says what that covers, how to verify it and who decides.
 */
export const DESIGN_CAUTIONS: readonly string[] = [
  "Sizing and uncertainty results are model estimates for the stated ambient profile (or the trace chosen as the ambient), not measurements: a route warmer or longer than that ambient is not covered.",
  "Verify a pack design with a physical test (a probe test: the product with a probe, in the real pack, on a representative route) before relying on it, and add a margin beyond the sized value.",
  "Local regulations and licensed food-safety practice decide whether a design is acceptable; these results support, and do not replace, that decision.",
];
