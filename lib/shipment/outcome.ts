// A shipment's outcome from its logger × product reviews. For each product the governing evidence is
// the review of the logger named as governing, or else the worst review among the loggers covering it;
// the shipment is rejected if any product's governing review rejects, held if any holds, accepted only
// if all accept.
import type { Outcome } from "../exposure/rules";

export const OUTCOME_RANK: Record<Outcome, number> = { accept: 0, hold: 1, reject: 2 };

export function worstOutcome(outcomes: readonly Outcome[]): Outcome {
  return outcomes.reduce<Outcome>((w, o) => (OUTCOME_RANK[o] > OUTCOME_RANK[w] ? o : w), "accept");
}

/** The part of a review result the combination reads (a stored result or the CLI's). */
export interface ReviewSummary {
  outcome: Outcome;
  rules: ReadonlyArray<{ id: string; channel: string; status: string; cumulative_min: number; excursions: ReadonlyArray<{ start: string; end: string; duration_min: number; peak_C: number; degree_min: number }> }>;
}

export interface LoggerReviews<R extends ReviewSummary = ReviewSummary> {
  /** how the logger is named in the output (its trace file, or a stored id) */
  key: string;
  position?: string;
  reviews: Array<{ product: string; governing?: boolean; result: R }>;
}

export interface ProductOutcome {
  product: string;
  outcome: Outcome;
  /** the key of the logger whose review governs this product */
  governing_logger: string;
  /** "named": the shipment names it; "worst": the worst of the loggers covering the product */
  governing_by: "named" | "worst";
}

export interface ShipmentOutcome {
  outcome: Outcome;
  products: ProductOutcome[];
  /** a named governing logger that is better than another logger covering the same product, in words */
  notes: string[];
  /** each logger's outcome: the worst of its reviews */
  loggers: Array<{ key: string; outcome: Outcome }>;
}

/** Total minutes beyond every rule threshold, the tie-break between reviews of the same outcome. */
function exposure_min(r: ReviewSummary): number {
  return r.rules.reduce((s, rule) => s + rule.cumulative_min, 0);
}

/**
 * Combines the reviews. Among loggers with the same worst outcome, the one with the most minutes beyond
 * the rule thresholds governs; on a further tie the first in the shipment's order.
 */
export function combineShipment(loggers: readonly LoggerReviews[]): ShipmentOutcome {
  const order: string[] = [];
  const byProduct = new Map<string, Array<{ key: string; governing: boolean; result: ReviewSummary }>>();
  for (const l of loggers) {
    for (const r of l.reviews) {
      if (!byProduct.has(r.product)) {
        byProduct.set(r.product, []);
        order.push(r.product);
      }
      byProduct.get(r.product)!.push({ key: l.key, governing: r.governing === true, result: r.result });
    }
  }
  const products: ProductOutcome[] = order.map((product) => {
    const candidates = byProduct.get(product)!;
    const named = candidates.filter((c) => c.governing);
    if (named.length > 1) throw new RangeError(`${product} has ${named.length} governing loggers; name one, or none to use the worst`);
    if (named.length === 1) return { product, outcome: named[0]!.result.outcome, governing_logger: named[0]!.key, governing_by: "named" };
    let worst = candidates[0]!;
    for (const c of candidates.slice(1)) {
      const d = OUTCOME_RANK[c.result.outcome] - OUTCOME_RANK[worst.result.outcome];
      if (d > 0 || (d === 0 && exposure_min(c.result) > exposure_min(worst.result))) worst = c;
    }
    return { product, outcome: worst.result.outcome, governing_logger: worst.key, governing_by: "worst" };
  });
  const notes: string[] = [];
  for (const p of products) {
    if (p.governing_by !== "named") continue;
    const worse = byProduct.get(p.product)!.filter((c) => OUTCOME_RANK[c.result.outcome] > OUTCOME_RANK[p.outcome]);
    if (worse.length > 0) notes.push(`${p.product} is governed by ${p.governing_logger} (${p.outcome}), as the shipment names it, but ${worse.map((c) => `${c.key} gives ${c.result.outcome}`).join(", ")}: check that the governing logger really represents this product.`);
  }
  return {
    outcome: worstOutcome(products.map((p) => p.outcome)),
    products,
    notes,
    loggers: loggers.map((l) => ({ key: l.key, outcome: worstOutcome(l.reviews.map((r) => r.result.outcome)) })),
  };
}

export interface LoadExcursion {
  logger: string;
  position?: string;
  product: string;
  rule: string;
  channel: string;
  start: string;
  end: string;
  duration_min: number;
  peak_C: number;
  degree_min: number;
}

/**
 * The worst excursions across the load: every rule's excursions from every review, largest degree-minutes
 * first (then longest), at most `limit`. The air of one logger is the same for each of its products, so
 * an air excursion is listed once per logger.
 */
export function worstExcursions(loggers: readonly LoggerReviews[], limit = 10): LoadExcursion[] {
  const out: LoadExcursion[] = [];
  for (const l of loggers) {
    const airSeen = new Set<string>();
    for (const r of l.reviews) {
      for (const rule of r.result.rules) {
        for (const e of rule.excursions) {
          if (rule.channel === "air") {
            const k = `${rule.id}|${e.start}|${e.end}`;
            if (airSeen.has(k)) continue;
            airSeen.add(k);
          }
          out.push({ logger: l.key, position: l.position, product: rule.channel === "air" ? "(air)" : r.product, rule: rule.id, channel: rule.channel, ...e });
        }
      }
    }
  }
  out.sort((a, b) => b.degree_min - a.degree_min || b.duration_min - a.duration_min);
  return out.slice(0, limit);
}
