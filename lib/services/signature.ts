// Electronic signature of a review (issue 13; in the manner of 21 CFR Part 11 §11.200 and §11.50): the
// signed-in user re-enters their password (the second identification component), the stored inputs must
// still reproduce the review (re-checked here, recorded in the audit log), a limit set may ask for a second
// person, and the signature records who (user id and name), when, and what it means.
import { z } from "zod";
import type { Actor } from "../access/actor";
import { COMMENT_REQUIRED_MESSAGE, getReview, MIN_DIFFERING_COMMENT_CHARS, signReview, type ReviewChange } from "../db/reviews";
import { lastAuditEntry } from "../db/auditQueries";
import { recheckReview } from "./recheck";
import { reauthenticate } from "./access";

export const signatureSchema = z.object({
  decision: z.enum(["accept", "hold", "reject"], { error: "choose accept, hold or reject" }),
  comment: z.string().trim().max(2000, { message: "at most 2,000 characters" }).optional(),
  password: z.string().min(1, { message: "re-enter your password to sign" }).max(256),
});

/** What each decision means when signed: the words recorded with the signature and shown on the report. */
export const SIGNATURE_MEANING: Record<"accept" | "hold" | "reject", string> = {
  accept: "Released: I reviewed this record and release the product",
  hold: "Held: I reviewed this record and hold the product for further review",
  reject: "Rejected: I reviewed this record and reject the product",
};

export type SignatureOutcome =
  | { ok: true }
  | { ok: false; reason: "not-a-user" | "password" | "second-person" | "not-reproduced" | "not-found" | "signed" | "comment-required"; message: string; field?: "password" | "comment" };

/** The user id that ran a review, from its "run" audit entry (null for the demo loader, the CLI, …). */
async function runBy(reviewId: string): Promise<string | null> {
  const e = await lastAuditEntry(reviewId, "run");
  const a = (e?.details as { actor?: { kind?: string; user_id?: string } } | null)?.actor;
  return (a?.kind === "user" || a?.kind === "token") && a.user_id ? a.user_id : null;
}

/**
 * Signs a review as `actor`, who must be a signed-in user (a token alone cannot sign). Checks, in order:
 * the password, the second-person rule of the review's limit set, that the stored inputs still reproduce
 * the review; then the decision and comment rules (lib/db/reviews.ts signReview) in one transaction.
 */
export async function signReviewWithPassword(reviewId: string, input: z.input<typeof signatureSchema>, actor: Actor, opts: { tokenWithOwnerPassword?: boolean } = {}): Promise<SignatureOutcome> {
  // The HTTP API (POST /api/v1/reviews/{id}/sign-off) passes tokenWithOwnerPassword: the token names its
  // owner and the owner's password is the second component; a token alone still cannot sign.
  if (actor.kind !== "user" && !(opts.tokenWithOwnerPassword && actor.kind === "token")) return notAUser();
  const s = signatureSchema.parse(input);
  // what the form can settle without the password first, so a form that could never be signed does not use
  // up attempts toward the lockout; signReview checks it again in its transaction
  const review = await getReview(reviewId);
  if (!review) return { ok: false, reason: "not-found", message: "that review does not exist" };
  const early = commentProblem(s.decision, s.comment, review.outcome);
  if (early) return early;
  const auth = await reauthenticate(actor.userId, s.password, { actor, signing: `review ${reviewId}` });
  if (!auth.ok) return refusedPassword(auth.message);
  const refusal = await signableProblem(reviewId, actor);
  if (refusal) return refusal;
  const res: ReviewChange = await signReview(reviewId, { reviewer: actor.name, decision: s.decision, comment: s.comment || undefined, meaning: SIGNATURE_MEANING[s.decision] }, actor);
  if (!res.ok) return { ok: false, reason: res.reason, message: res.message, ...(res.reason === "comment-required" ? { field: "comment" as const } : {}) };
  return { ok: true };
}

const notAUser = (): SignatureOutcome => ({ ok: false, reason: "not-a-user", message: "a signature needs a signed-in person who re-enters their password; a token or a script cannot sign" });
const refusedPassword = (message: string): SignatureOutcome => ({ ok: false, reason: "password", field: "password", message });

/** The identification components of a signature: a signed-in person and their password, re-entered (counted toward lockout). */
export async function signerProblem(actor: Actor, password: string, signing: string): Promise<SignatureOutcome | null> {
  if (actor.kind !== "user") return notAUser();
  const auth = await reauthenticate(actor.userId, password, { actor, signing });
  return auth.ok ? null : refusedPassword(auth.message);
}

/** A decision that differs from the suggested outcome needs a comment (the rule signReview and signShipment enforce). */
export function commentProblem(decision: string, comment: string | undefined, suggested: string): SignatureOutcome | null {
  if (decision === suggested || (comment ?? "").trim().length >= MIN_DIFFERING_COMMENT_CHARS) return null;
  return { ok: false, reason: "comment-required", field: "comment", message: COMMENT_REQUIRED_MESSAGE };
}

/**
 * Why `actor` may not sign this review now, or null: it is missing or signed, the second-person rule of
 * its limit set, or its stored inputs no longer reproduce it (re-checked here; the re-check is recorded).
 */
export async function signableProblem(reviewId: string, actor: Extract<Actor, { kind: "user" | "token" }>): Promise<SignatureOutcome | null> {
  const review = await getReview(reviewId);
  if (!review) return { ok: false, reason: "not-found", message: "that review does not exist" };
  if (review.status === "signed") return { ok: false, reason: "signed", message: "this review is already signed off; a correction is a new review" };
  const limits = review.limits.body as { second_person_review?: boolean };
  if (limits.second_person_review && (await runBy(reviewId)) === actor.userId) {
    return { ok: false, reason: "second-person", message: `the limit set "${review.limits.name}" asks for second-person review: someone other than the person who ran "${review.title}" must sign it` };
  }
  const check = await recheckReview(reviewId, actor);
  if (!check.ok) return { ok: false, reason: "not-found", message: check.message };
  if (!check.check.reproduced) {
    return { ok: false, reason: "not-reproduced", message: `the stored inputs no longer reproduce "${review.title}", so it cannot be signed (re-check recorded as audit entry ${check.seq}): ${check.check.problems.slice(0, 3).join("; ")}` };
  }
  return null;
}

/** Who may sign a review, in words for the page: the second-person rule and the signer's role. */
export async function signatureRules(reviewId: string): Promise<{ secondPerson: boolean; runByUserId: string | null }> {
  const review = await getReview(reviewId);
  const limits = (review?.limits.body ?? {}) as { second_person_review?: boolean };
  return { secondPerson: limits.second_person_review === true, runByUserId: await runBy(reviewId) };
}
