/** Shown with every consequence estimate, on screen, in the CLI output and in exports. */
export const CONSEQUENCE_CAUTIONS: readonly string[] = [
  "Growth and shelf-life figures are model estimates from a predicted or recorded temperature history; their parameters must be validated for this product.",
  "They do not replace challenge tests, the food business operator's own shelf-life studies, or local regulations.",
];
