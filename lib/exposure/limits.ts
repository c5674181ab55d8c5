import { z } from "zod";
import { capped, quantity, strictObject } from "../quantity";

export const CHANNELS = ["air", "core", "surface", "mean", "probe"] as const;
export type Channel = (typeof CHANNELS)[number];

/** Allowances: 0 to one year of minutes (525 600). */
const minutes = (what: string) => quantity(what, "min", 0, 525_600);
/** Thresholds: -100 to 200 °C, beyond any cold chain or cooking step. */
const celsius = (what: string) => quantity(what, "°C", -100, 200);

export const MAX_RULES = 100;

/**
 * One rule: a threshold on one channel ("above_C": time above it counts; "below_C": time below it
 * counts) with optional allowances. A rule with none of the three allowances allows no time beyond.
 */
export const ruleSchema = strictObject({
    id: z.string().trim().min(1, { message: "rule id is required" }).max(60),
    channel: z.enum(CHANNELS, { error: `channel must be one of ${CHANNELS.join(", ")}` }),
    above_C: celsius("above_C").optional(),
    below_C: celsius("below_C").optional(),
    max_cumulative_min: minutes("max_cumulative_min").optional(),
    max_continuous_min: minutes("max_continuous_min").optional(),
    max_peak_C: celsius("max_peak_C").optional(),
  }).refine((r) => (r.above_C === undefined) !== (r.below_C === undefined), {
    message: "give exactly one of above_C or below_C",
    path: ["above_C"],
  });
export type Rule = z.infer<typeof ruleSchema>;

export const limitSetSchema = strictObject({
    name: z.string().trim().min(1).max(120).default("Limits"),
    rules: capped(ruleSchema, "rules", MAX_RULES).min(1, { message: "a limit set needs at least one rule" }),
    /** stated accuracy of the logger's sensor, K; widens every rule's guard band */
    sensor_accuracy_K: quantity("sensor_accuracy_K", "K", 0, 10).optional(),
  }).refine((s) => new Set(s.rules.map((r) => r.id)).size === s.rules.length, {
    message: "rule ids must be unique",
    path: ["rules"],
  });
export type LimitSet = z.infer<typeof limitSetSchema>;
