// Input uncertainty propagated by seeded Monte Carlo. Below review and design so that both use it.
export * from "./random";
export * from "./monteCarlo";
export * from "./cost";
