import { z } from "zod";
import { modelChoiceSchema, packSchema, productSchema, type Pack, type Product } from "../thermal/definitions";
import { limitSetSchema, type LimitSet } from "../exposure/limits";
import { runReview, ENGINE_VERSION, resultHash, unsupportedRule } from "../review";
import { getTrace } from "../db/traces";
import { getDefinition } from "../db/definitions";
import { createReview } from "../db/reviews";

export const runReviewRequestSchema = z.object({
  title: z.string().trim().min(1, { message: "give the review a title" }).max(160),
  traceId: z.string().min(1, { message: "choose a trace" }),
  productId: z.string().min(1, { message: "choose a product" }),
  /** optional: without a pack the product's own surface coefficient is used */
  packId: z.string().optional(),
  limitsId: z.string().min(1, { message: "choose a limit set" }),
  model: modelChoiceSchema.default("auto"),
});
export type RunReviewRequest = z.input<typeof runReviewRequestSchema>;

export type RunReviewOutcome = { ok: true; reviewId: string } | { ok: false; field: keyof RunReviewRequest | "form"; message: string };

/** Loads the exact stored inputs, runs the engine and stores the review pointing at those versions. */
export async function runAndStoreReview(request: RunReviewRequest): Promise<RunReviewOutcome> {
  const req = runReviewRequestSchema.parse(request);
  const trace = await getTrace(req.traceId);
  if (!trace) return { ok: false, field: "traceId", message: "that trace does not exist" };
  const productDef = await getDefinition<Product>(req.productId);
  if (!productDef || productDef.kind !== "product") return { ok: false, field: "productId", message: "that product does not exist" };
  const packDef = req.packId ? await getDefinition<Pack>(req.packId) : null;
  if (req.packId && (!packDef || packDef.kind !== "pack")) return { ok: false, field: "packId", message: "that pack does not exist" };
  const limitsDef = await getDefinition<LimitSet>(req.limitsId);
  if (!limitsDef || limitsDef.kind !== "limits") return { ok: false, field: "limitsId", message: "that limit set does not exist" };
  // Stored bodies were validated when saved; parse again so the engine never sees an unchecked value.
  const product = productSchema.parse(productDef.body);
  const pack = packDef ? packSchema.parse(packDef.body) : undefined;
  const limits = limitSetSchema.parse(limitsDef.body);
  const bad = unsupportedRule(limits);
  if (bad) return { ok: false, field: "limitsId", message: `rule '${bad.id}' is on the '${bad.channel}' channel, which a review does not produce yet` };
  if (!pack && product.h_W_m2K === undefined) return { ok: false, field: "packId", message: "this product has no surface coefficient of its own: choose a pack" };
  if (req.model === "conduction" && (!product.shape || (!product.composition && product.properties?.k_W_mK === undefined))) {
    return { ok: false, field: "model", message: "the conduction model needs the product's shape and conductivity" };
  }
  const options = { model: req.model };
  const comp = runReview({ series: trace.series, product, pack, limits, options });
  const reviewId = await createReview({
    title: req.title,
    traceId: trace.meta.id,
    productId: productDef.id,
    packId: packDef?.id,
    limitsId: limitsDef.id,
    options,
    engineVersion: ENGINE_VERSION,
    computation: comp,
    resultSha256: resultHash(comp.result, comp.core_C),
  });
  return { ok: true, reviewId };
}
