import { z } from "zod";
import { storedRefusal } from "./storedRefusal";
import { modelChoiceSchema, packSchema, productSchema, type Pack, type Product } from "../thermal/definitions";
import { CHANNELS, limitSetSchema, type LimitSet } from "../exposure/limits";
import { unmatchedConsequenceRule } from "../exposure/consequenceRules";
import { runReview, tryRunReview, ENGINE_VERSION, REPRODUCIBLE_ENGINE_VERSIONS, resultHash, unsupportedRule, canonicalJson, type ReviewComputation, type ReviewInput, type ReviewOptions } from "../review";
import { importTraceFile, optionsFromSettings, sha256Hex } from "../trace";
import { getTrace, getTraceOriginal } from "../db/traces";
import { getDefinition } from "../db/definitions";
import { createReview, getReview, signReview, type NewReview } from "../db/reviews";
import { uncertaintySpecSchema } from "../uncertainty/monteCarlo";
import type { Actor } from "../access/actor";

const isoTime = z.iso.datetime({ offset: true, message: "must be an ISO 8601 date-time with Z or an offset" });

export const runReviewRequestSchema = z
  .object({
    title: z.string().trim().min(1, { message: "give the review a title" }).max(160),
    traceId: z.string().min(1, { message: "choose a trace" }),
    productId: z.string().min(1, { message: "choose a product" }),
    /** optional: without a pack the product's own surface coefficient is used */
    packId: z.string().optional(),
    limitsId: z.string().min(1, { message: "choose a limit set" }),
    model: modelChoiceSchema.default("auto"),
    windowStart: isoTime.optional(),
    windowEnd: isoTime.optional(),
    /** the signed review this run corrects */
    correctsId: z.string().optional(),
    /** optional Monte Carlo propagation of input uncertainty */
    uncertainty: uncertaintySpecSchema.optional(),
    /** channels to apply the product's growth and shelf-life models to besides the core */
    consequenceChannels: z.array(z.enum(CHANNELS, { error: `consequence channel must be one of ${CHANNELS.join(", ")}` })).max(CHANNELS.length).optional(),
  })
  .refine((r) => (r.windowStart === undefined) === (r.windowEnd === undefined), { message: "give both ends of the window, or neither", path: ["windowEnd"] })
  .refine((r) => r.windowStart === undefined || Date.parse(r.windowEnd!) > Date.parse(r.windowStart), { message: "the window must end after it starts", path: ["windowEnd"] });
export type RunReviewRequest = z.input<typeof runReviewRequestSchema>;

type Field = "title" | "traceId" | "productId" | "packId" | "limitsId" | "model" | "windowStart" | "windowEnd" | "correctsId" | "uncertainty" | "consequenceChannels" | "form";
export type RunReviewOutcome = { ok: true; reviewId: string } | { ok: false; field: Field; message: string };

/** A review ready to run: the engine's input and the exact stored versions it was loaded from. */
export interface PreparedReview {
  title: string;
  input: ReviewInput;
  traceId: string;
  productId: string;
  packId?: string;
  limitsId: string;
  correctsId?: string;
}
export type PrepareOutcome = { ok: true; prepared: PreparedReview } | { ok: false; field: Field; message: string };

/** Loads and re-validates the exact stored inputs of a review request; refuses by field what cannot run. */
export async function prepareReview(request: RunReviewRequest): Promise<PrepareOutcome> {
  const req = runReviewRequestSchema.parse(request);
  const trace = await getTrace(req.traceId);
  if (!trace) return { ok: false, field: "traceId", message: "that trace does not exist" };
  const productDef = await getDefinition<Product>(req.productId);
  if (!productDef || productDef.kind !== "product") return { ok: false, field: "productId", message: "that product does not exist" };
  const packDef = req.packId ? await getDefinition<Pack>(req.packId) : null;
  if (req.packId && (!packDef || packDef.kind !== "pack")) return { ok: false, field: "packId", message: "that pack does not exist" };
  const limitsDef = await getDefinition<LimitSet>(req.limitsId);
  if (!limitsDef || limitsDef.kind !== "limits") return { ok: false, field: "limitsId", message: "that limit set does not exist" };
  if (req.correctsId) {
    const old = await getReview(req.correctsId);
    if (!old) return { ok: false, field: "correctsId", message: "the review to correct does not exist" };
    if (old.status !== "signed") return { ok: false, field: "correctsId", message: "only a signed review is corrected by a new one; an open review can simply be re-run" };
  }
  // Stored bodies were validated when saved; parse again so the engine never sees an unchecked value.
  // A definition saved before a schema tightened (a range, an unknown field) is refused by name.
  const productParsed = productSchema.safeParse(productDef.body);
  if (!productParsed.success) return { ok: false, field: "productId", message: storedRefusal("product", productDef, productParsed.error) };
  const packParsed = packDef ? packSchema.safeParse(packDef.body) : undefined;
  if (packParsed && !packParsed.success) return { ok: false, field: "packId", message: storedRefusal("pack", packDef!, packParsed.error) };
  const limitsParsed = limitSetSchema.safeParse(limitsDef.body);
  if (!limitsParsed.success) return { ok: false, field: "limitsId", message: storedRefusal("limit set", limitsDef, limitsParsed.error) };
  const product = productParsed.data;
  const pack = packParsed?.data;
  const limits = limitsParsed.data;
  const bad = unsupportedRule(limits, trace.series.probe_C !== undefined);
  if (bad) {
    const why = bad.channel === "probe" ? "this trace has no product-probe column" : "a review does not produce it";
    return { ok: false, field: "limitsId", message: `rule '${bad.id}' is on the '${bad.channel}' channel, but ${why}` };
  }
  const unmatched = unmatchedConsequenceRule(limits, product.consequences ?? []);
  if (unmatched) return { ok: false, field: "limitsId", message: `${unmatched.message}: choose a product that has it, or add it to this product` };
  if (!pack && product.h_W_m2K === undefined) return { ok: false, field: "packId", message: "this product has no surface coefficient of its own: choose a pack" };
  if ((req.model === "conduction" || req.model === "conduction-1d") && (!product.shape || (!product.composition && product.properties?.k_W_mK === undefined))) {
    return { ok: false, field: "model", message: "the conduction model needs the product's shape and conductivity" };
  }
  const channels = [...new Set(req.consequenceChannels ?? [])].filter((c) => c !== "core");
  if (channels.includes("probe") && trace.series.probe_C === undefined) return { ok: false, field: "consequenceChannels", message: "this trace has no product-probe column to apply the growth and shelf-life models to" };
  if (channels.length > 0 && !(product.consequences?.length)) return { ok: false, field: "consequenceChannels", message: "this product has no growth or shelf-life models to apply" };
  const options: ReviewOptions = { model: req.model, ...(req.uncertainty ? { uncertainty: req.uncertainty } : {}), ...(channels.length ? { consequence_channels: channels } : {}) };
  if (req.uncertainty) {
    const base = { product, pack } as Record<string, unknown>;
    for (const u of req.uncertainty.inputs) {
      const v = u.path.split(".").reduce<unknown>((o, k) => (o && typeof o === "object" ? (o as Record<string, unknown>)[k] : undefined), base);
      if (typeof v !== "number") return { ok: false, field: "uncertainty", message: `'${u.path}' does not name a number of this product or pack` };
    }
  }
  if (req.windowStart && req.windowEnd) {
    const start_s = Date.parse(req.windowStart) / 1000, end_s = Date.parse(req.windowEnd) / 1000;
    const t = trace.series.t_s;
    if (start_s < t[0]! || end_s > t[t.length - 1]!) {
      return { ok: false, field: "windowStart", message: `the window must lie inside the trace (${trace.meta.startAt.toISOString()} to ${trace.meta.endAt.toISOString()})` };
    }
    options.window = { start_s, end_s };
  }
  return {
    ok: true,
    prepared: {
      title: req.title,
      input: { series: trace.series, product, pack, limits, options, gapMultiple: trace.meta.importSettings.gapMultiple },
      traceId: trace.meta.id,
      productId: productDef.id,
      packId: packDef?.id,
      limitsId: limitsDef.id,
      correctsId: req.correctsId,
    },
  };
}

/** Stores a computed review with its run audit entry (one transaction). */
export async function storeReview(p: PreparedReview, comp: ReviewComputation, actor: Actor, id?: string): Promise<string> {
  return createReview(newReviewOf(p, comp, actor, id));
}

/** The stored form of a computed review (for storing several in one transaction, as a shipment does). */
export function newReviewOf(p: PreparedReview, comp: ReviewComputation, actor: Actor, id?: string): NewReview {
  return {
    id,
    title: p.title,
    traceId: p.traceId,
    productId: p.productId,
    packId: p.packId,
    limitsId: p.limitsId,
    options: p.input.options as unknown as Record<string, unknown>,
    engineVersion: ENGINE_VERSION,
    computation: comp,
    resultSha256: resultHash(comp.result, comp.core_C),
    correctsId: p.correctsId,
    actor,
  };
}

/** Loads the exact stored inputs, runs the engine in this thread and stores the review (CLI, demo, tests). */
export async function runAndStoreReview(request: RunReviewRequest, actor: Actor): Promise<RunReviewOutcome> {
  const ready = await prepareReview(request);
  if (!ready.ok) return ready;
  const attempt = tryRunReview(ready.prepared.input);
  if (!attempt.ok) return { ok: false, field: "form", message: attempt.message };
  return { ok: true, reviewId: await storeReview(ready.prepared, attempt.computation, actor) };
}

/**
 * What a reviewer submits. There is no "suggested" field: whether the decision differs from the
 * suggestion is decided against the stored outcome (signReview), never against what a form says.
 */
export const signOffSchema = z.object({
  reviewer: z.string().trim().min(2, { message: "give the reviewer's name" }).max(120),
  decision: z.enum(["accept", "hold", "reject"], { error: "choose accept, hold or reject" }),
  comment: z.string().trim().max(2000, { message: "at most 2,000 characters" }).optional(),
});

export async function signOff(reviewId: string, input: z.input<typeof signOffSchema>, actor: Actor) {
  const s = signOffSchema.parse(input);
  return signReview(reviewId, { reviewer: s.reviewer, decision: s.decision, comment: s.comment || undefined }, actor);
}

export interface ReproductionCheck {
  id: string;
  title: string;
  reproduced: boolean;
  problems: string[];
}

/**
 * Re-runs a stored review from its stored inputs and checks every link: the trace's bytes still hash
 * to the recorded SHA-256, re-importing them with the recorded settings gives the stored series bit
 * for bit, each definition still hashes to its recorded hash, and the engine gives the recorded
 * result hash.
 */
export async function verifyStoredReview(id: string): Promise<ReproductionCheck> {
  const review = await getReview(id);
  if (!review) return { id, title: "", reproduced: false, problems: ["no such review"] };
  const problems: string[] = [];
  const trace = await getTrace(review.traceId);
  const stored = await getTraceOriginal(review.traceId);
  if (!trace || !stored) return { id, title: review.title, reproduced: false, problems: [`its trace ${review.traceId} is missing`] };
  const original = stored.bytes;
  if (sha256Hex(original) !== trace.meta.sha256) problems.push("the trace's original bytes no longer match their SHA-256");
  try {
    const again = await importTraceFile(original, optionsFromSettings(trace.meta.importSettings));
    const same = (x: Float64Array, y: Float64Array) => x.length === y.length && Buffer.compare(Buffer.from(x.buffer, x.byteOffset, x.byteLength), Buffer.from(y.buffer, y.byteOffset, y.byteLength)) === 0;
    const probeSame = again.series.probe_C === undefined ? trace.series.probe_C === undefined : trace.series.probe_C !== undefined && same(again.series.probe_C, trace.series.probe_C);
    if (!same(again.series.t_s, trace.series.t_s) || !same(again.series.air_C, trace.series.air_C) || !probeSame) problems.push("re-importing the original bytes with the recorded settings gives a different series");
  } catch (e) {
    problems.push(`re-importing the original bytes fails: ${(e as Error).message}`);
  }
  for (const def of [review.product, review.pack, review.limits]) {
    if (def && sha256Hex(canonicalJson(def.body)) !== def.sha256) problems.push(`definition ${def.name} v${def.version} no longer matches its hash`);
  }
  // An earlier engine whose results this one reproduces is re-run as that version (it stamps the result).
  const asEarlier = REPRODUCIBLE_ENGINE_VERSIONS.includes(review.engineVersion);
  if (review.engineVersion !== ENGINE_VERSION && !asEarlier) problems.push(`recorded with engine ${review.engineVersion}; this is engine ${ENGINE_VERSION}`);
  // A stored definition that today's schema refuses (a range added since) is named, not dumped as zod issues.
  const checked = <T>(schema: z.ZodType<T>, noun: string, def: { name: string; version: number; body: unknown }): T => {
    const r = schema.safeParse(def.body);
    if (!r.success) throw new Error(storedRefusal(noun, def, r.error));
    return r.data;
  };
  try {
    const comp = runReview({
      series: trace.series,
      product: checked(productSchema, "product", review.product),
      pack: review.pack ? checked(packSchema, "pack", review.pack) : undefined,
      limits: checked(limitSetSchema, "limit set", review.limits),
      options: review.options as unknown as ReviewOptions,
      gapMultiple: trace.meta.importSettings.gapMultiple,
      ...(asEarlier ? { engineVersion: review.engineVersion } : {}),
    });
    if (resultHash(comp.result, comp.core_C) !== review.resultSha256) problems.push("re-running the engine gives a different result hash");
  } catch (e) {
    problems.push(`re-running the engine fails: ${(e as Error).message}`);
  }
  return { id, title: review.title, reproduced: problems.length === 0, problems };
}
