import { z } from "zod";
import { quantity, strictObject } from "../quantity";

// Consequence models carried by a product (issue 16): shelf life consumed, and growth of a named organism.
// Parameters are the user's (or cited to their original paper); every output is an estimate to be validated
// for the product. Ranges are listed in README.md, "Plausible ranges".

const modelId = z.string().trim().min(1, { message: "consequence id is required" }).max(40).regex(/^[A-Za-z0-9_.-]+$/, { message: "consequence id may use letters, digits, '_', '.' and '-' only" });
/** Temperatures of the models: −60 °C (deep-frozen storage) to 150 °C, as the product's temperatures. */
const celsius = (what: string) => quantity(what, "°C", -60, 150);

/**
 * Relative rate of spoilage (RRS) against a shelf life known at one reference temperature. The temperature
 * dependence: "sqrt" (rate ∝ (T − Tmin)² above a notional Tmin, zero below; the form of Ratkowsky et al. 1982,
 * used for shelf life as in Dalgaard 2002), "arrhenius" (activation energy Ea) or "q10" (the rate multiplies
 * by Q10 for every 10 K).
 */
const shelfLifeBase = {
  id: modelId,
  kind: z.literal("shelf_life"),
  /** temperature at which the shelf life is known, °C */
  reference_C: celsius("reference_C"),
  /** shelf life at the reference temperature: 1 hour to 5 years */
  shelf_life_days: quantity("shelf_life_days", "days", 0.04, 1826),
  /** storage temperature for the remaining shelf life (default the reference temperature), °C */
  storage_C: celsius("storage_C").optional(),
};
export const shelfLifeModelSchema = z.discriminatedUnion(
  "dependence",
  [
    strictObject({ ...shelfLifeBase, dependence: z.literal("sqrt"), tmin_C: quantity("tmin_C", "°C", -60, 40) }),
    /** Ea 1 to 500 kJ/mol (spoilage reactions and growth are about 40–150) */
    strictObject({ ...shelfLifeBase, dependence: z.literal("arrhenius"), ea_kJ_mol: quantity("ea_kJ_mol", "kJ/mol", 1, 500) }),
    /** Q10 from 1 (no dependence) to 20 */
    strictObject({ ...shelfLifeBase, dependence: z.literal("q10"), q10: quantity("q10", "", 1, 20) }),
  ],
  { error: "dependence must be sqrt, arrhenius or q10" },
).superRefine((m, ctx) => {
  if (m.dependence === "sqrt" && m.reference_C <= m.tmin_C) ctx.addIssue({ code: "custom", path: ["tmin_C"], message: "tmin_C must be below reference_C (no spoilage at or below Tmin)" });
});
export type ShelfLifeModel = z.infer<typeof shelfLifeModelSchema>;

/**
 * Growth of a named organism: the square-root secondary model √μmax = b·(T − Tmin) (Ratkowsky et al. 1982),
 * times (1 − exp(c·(T − Tmax))) when Tmax and c are given (Ratkowsky et al. 1983), μmax in 1/h for
 * natural-log counts; primary model Baranyi and Roberts (1994). Lag by q0, or by lag_h turned into q0 through
 * h0 = μmax·λ at the product's initial temperature; neither: no lag.
 */
export const growthModelSchema = strictObject({
  id: modelId,
  kind: z.literal("growth"),
  organism: z.string().trim().min(1, { message: "organism is required (free text)" }).max(120),
  /** 0.001 to 1 per (°C·√h) (published b values for bacteria in foods lie near 0.01–0.05) */
  b_per_C_sqrt_h: quantity("b_per_C_sqrt_h", "1/(°C·√h)", 0.001, 1),
  tmin_C: quantity("tmin_C", "°C", -30, 40),
  tmax_C: quantity("tmax_C", "°C", 0, 80).optional(),
  c_per_C: quantity("c_per_C", "1/°C", 0.001, 10).optional(),
  /** lag time at the product's initial temperature, h (up to a year) */
  lag_h: quantity("lag_h", "h", 0, 8760).optional(),
  /** physiological state of the cells (Baranyi and Roberts 1994): 1e-12 to 1e6 */
  q0: quantity("q0", "", 1e-12, 1e6).optional(),
  /** initial population, log10 CFU/g */
  initial_log10: quantity("initial_log10", "log10 CFU/g", -5, 12).optional(),
  /** maximum population density, log10 CFU/g (needs initial_log10) */
  max_log10: quantity("max_log10", "log10 CFU/g", -5, 12).optional(),
  /** where the parameters come from: the original paper, or "own data" */
  source: z.string().trim().min(1, { message: "source is required: cite the paper or name your own data" }).max(300),
}).superRefine((m, ctx) => {
  if ((m.tmax_C === undefined) !== (m.c_per_C === undefined)) ctx.addIssue({ code: "custom", path: [m.tmax_C === undefined ? "tmax_C" : "c_per_C"], message: "give both tmax_C and c_per_C (the extended square-root model), or neither" });
  if (m.tmax_C !== undefined && m.tmax_C <= m.tmin_C) ctx.addIssue({ code: "custom", path: ["tmax_C"], message: "tmax_C must be above tmin_C" });
  if (m.lag_h !== undefined && m.q0 !== undefined) ctx.addIssue({ code: "custom", path: ["q0"], message: "give lag_h or q0, not both" });
  if (m.max_log10 !== undefined && m.initial_log10 === undefined) ctx.addIssue({ code: "custom", path: ["initial_log10"], message: "initial_log10 is required with max_log10" });
  if (m.max_log10 !== undefined && m.initial_log10 !== undefined && m.max_log10 <= m.initial_log10) ctx.addIssue({ code: "custom", path: ["max_log10"], message: "max_log10 must be above initial_log10" });
});
export type GrowthModel = z.infer<typeof growthModelSchema>;

export const consequenceModelSchema = z.discriminatedUnion("kind", [shelfLifeModelSchema, growthModelSchema], { error: "consequence kind must be shelf_life or growth" });
export type ConsequenceModel = z.infer<typeof consequenceModelSchema>;

export const MAX_CONSEQUENCES = 20;
