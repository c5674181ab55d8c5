// The growth model and growth-only limit set of the sizing end-to-end test (shared by the seed script and the spec).
export const GROWTH_SUFFIX = " (growth e2e)";
export const GROWTH_MODEL = { id: "lm", kind: "growth", organism: "test organism (invented parameters)", b_per_C_sqrt_h: 0.03, tmin_C: -1.5, source: "invented for the end-to-end test" };
export const GROWTH_LIMITS = { name: "Growth only" + GROWTH_SUFFIX, sensor_accuracy_K: 0.5, rules: [{ id: "lm-0.3", kind: "growth", model: "lm", max_log10_increase: 0.3 }] };
