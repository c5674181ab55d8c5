import { z } from "zod";

export const CHANNELS = ["air", "core", "surface", "mean", "probe"] as const;
export type Channel = (typeof CHANNELS)[number];

const minutes = (what: string) => z.number({ error: `${what} must be a number of minutes` }).finite().min(0, { message: `${what} cannot be negative` });
const celsius = z.number({ error: "must be a temperature in °C" }).finite().min(-100).max(200);

/**
 * One rule: a threshold on one channel ("above_C": time above it counts; "below_C": time below it
 * counts) with optional allowances. A rule with none of the three allowances allows no time beyond.
 */
export const ruleSchema = z
  .object({
    id: z.string().trim().min(1, { message: "rule id is required" }).max(60),
    channel: z.enum(CHANNELS, { error: `channel must be one of ${CHANNELS.join(", ")}` }),
    above_C: celsius.optional(),
    below_C: celsius.optional(),
    max_cumulative_min: minutes("max_cumulative_min").optional(),
    max_continuous_min: minutes("max_continuous_min").optional(),
    max_peak_C: celsius.optional(),
  })
  .refine((r) => (r.above_C === undefined) !== (r.below_C === undefined), {
    message: "give exactly one of above_C or below_C",
    path: ["above_C"],
  });
export type Rule = z.infer<typeof ruleSchema>;

export const limitSetSchema = z
  .object({
    name: z.string().trim().min(1).max(120).default("Limits"),
    rules: z.array(ruleSchema).min(1, { message: "a limit set needs at least one rule" }),
    /** stated accuracy of the logger's sensor, K; widens every rule's guard band */
    sensor_accuracy_K: z.number().finite().min(0).max(10).optional(),
  })
  .refine((s) => new Set(s.rules.map((r) => r.id)).size === s.rules.length, {
    message: "rule ids must be unique",
    path: ["rules"],
  });
export type LimitSet = z.infer<typeof limitSetSchema>;
