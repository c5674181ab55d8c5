export * from "./timeAbove";
export * from "./mkt";
export * from "./limits";
export * from "./rules";
export * from "./window";
export * from "./templates";
export * from "./bands";
export * from "./consequenceRules";
