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
const ruleId = z.string().trim().min(1, { message: "rule id is required" }).max(60);

/** A threshold rule (the first kind; "kind" may be left out or be "threshold"). */
export const thresholdRuleSchema = strictObject({
    id: ruleId,
    kind: z.literal("threshold").optional(),
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
export type ThresholdRule = z.infer<typeof thresholdRuleSchema>;

const consequenceChannel = z.enum(CHANNELS, { error: `channel must be one of ${CHANNELS.join(", ")}` }).optional();
/** Growth rule: at most this log10 increase of the product's growth model `model` (on the core unless `channel` says otherwise). */
export const growthRuleSchema = strictObject({
  id: ruleId,
  kind: z.literal("growth"),
  model: z.string().trim().min(1, { message: "model is required: the id of a growth model on the product" }).max(40),
  /** 0 to 12 log10 units */
  max_log10_increase: quantity("max_log10_increase", "log10", 0, 12),
  channel: consequenceChannel,
});
/** Shelf-life rule: at most this percentage of the shelf life consumed (the product's shelf-life model, or the one named). */
export const shelfLifeRuleSchema = strictObject({
  id: ruleId,
  kind: z.literal("shelf_life"),
  max_consumed_percent: quantity("max_consumed_percent", "%", 0, 100),
  model: z.string().trim().min(1).max(40).optional(),
  channel: consequenceChannel,
});
export type GrowthRule = z.infer<typeof growthRuleSchema>;
export type ShelfLifeRule = z.infer<typeof shelfLifeRuleSchema>;
export type ConsequenceRule = GrowthRule | ShelfLifeRule;

export const ruleSchema = z.discriminatedUnion("kind", [thresholdRuleSchema, growthRuleSchema, shelfLifeRuleSchema], {
  error: "rule kind must be growth or shelf_life, or left out for a threshold rule",
});
export type Rule = z.infer<typeof ruleSchema>;

export const isThresholdRule = (r: Rule): r is ThresholdRule => r.kind === undefined || r.kind === "threshold";
export const isConsequenceRule = (r: Rule): r is ConsequenceRule => r.kind === "growth" || r.kind === "shelf_life";
/** The channel a rule judges: consequence rules default to the core. */
export const ruleChannel = (r: Rule): Channel => r.channel ?? "core";

export const limitSetSchema = strictObject({
    name: z.string().trim().min(1).max(120).default("Limits"),
    rules: capped(ruleSchema, "rules", MAX_RULES).min(1, { message: "a limit set needs at least one rule" }),
    /** stated accuracy of the logger's sensor, K; widens every rule's guard band */
    sensor_accuracy_K: quantity("sensor_accuracy_K", "K", 0, 10).optional(),
    /** second-person review: a review against this limit set must be signed by someone other than the user who ran it */
    second_person_review: z.boolean({ error: "second_person_review must be true or false" }).optional(),
  }).refine((s) => new Set(s.rules.map((r) => r.id)).size === s.rules.length, {
    message: "rule ids must be unique",
    path: ["rules"],
  });
export type LimitSet = z.infer<typeof limitSetSchema>;
