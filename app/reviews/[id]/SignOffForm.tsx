"use client";

import { useActionState, useState } from "react";
import { signOffReview, renameReviewAction } from "@/app/actions/reviews";
import { ActionForm } from "@/app/components/ActionForm";
import { Field, FormMessage } from "@/app/components/Field";
import type { FormState } from "@/lib/validation";

type Decision = "accept" | "hold" | "reject";

/**
 * Every field is controlled and the form never resets, so after a refusal the form shows exactly what
 * will be posted. `suggested` only words the hint; the server compares the decision with the stored outcome.
 */
export function SignOffForm({ reviewId, suggested, signer, secondPerson }: { reviewId: string; suggested: Decision; signer: { name: string; email: string }; secondPerson: boolean }) {
  const [state, action, pending] = useActionState<FormState, FormData>(signOffReview, {});
  const [password, setPassword] = useState("");
  const [decision, setDecision] = useState<Decision>(suggested);
  const [comment, setComment] = useState("");
  const commentError = state.fieldErrors?.comment;
  const passwordError = state.fieldErrors?.password;
  const decisionError = state.fieldErrors?.decision;
  return (
    <ActionForm action={action} className="stack" aria-label="Sign off">
      <input type="hidden" name="reviewId" value={reviewId} />
      <p data-testid="signing-as">Signing as <strong>{signer.name}</strong> ({signer.email})</p>
      <label htmlFor="f-decision">
        Decision
        <select id="f-decision" name="decision" value={decision} onChange={(e) => setDecision(e.target.value as Decision)} aria-invalid={decisionError ? true : undefined}>
          <option value="accept">accept</option>
          <option value="hold">hold for review</option>
          <option value="reject">reject</option>
        </select>
        {decisionError && <span className="field-error" data-testid="error-decision">{decisionError}</span>}
      </label>
      <label htmlFor="f-comment">
        Comment {decision !== suggested ? "(required: the decision differs from the suggested outcome)" : "(optional)"}
        <textarea id="f-comment" name="comment" rows={3} value={comment} onChange={(e) => setComment(e.target.value)} aria-invalid={commentError ? true : undefined} />
        {commentError && <span className="field-error" data-testid="error-comment">{commentError}</span>}
      </label>
      <label htmlFor="f-password">
        Your password
        <span className="hint">Re-enter it to sign: your signature is your account and your password together</span>
        <input id="f-password" name="password" type="password" autoComplete="current-password" value={password} onChange={(e) => setPassword(e.target.value)} aria-invalid={passwordError ? true : undefined} />
        {passwordError && <span className="field-error" data-testid="error-password">{passwordError}</span>}
      </label>
      <FormMessage state={state} />
      <p className="hint muted" data-testid="signature-rules">
        Signing re-checks the review first: if its stored inputs no longer reproduce it, it cannot be signed.
        {secondPerson && " This limit set asks for second-person review: the person who ran the review cannot sign it."}
        {" "}The signature records your name and account, the time, and what the decision means (released, held or rejected, with your comment).
      </p>
      <p className="hint muted">Signing off is final: the review can no longer be edited, and a correction becomes a new review that points back to this one.</p>
      <button type="submit" disabled={pending}>{pending ? "Signing…" : "Sign off"}</button>
    </ActionForm>
  );
}

export function RenameForm({ reviewId, title }: { reviewId: string; title: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(renameReviewAction, {});
  return (
    <ActionForm action={action} className="stack" aria-label="Rename">
      <input type="hidden" name="reviewId" value={reviewId} />
      <Field name="title" label="Title" defaultValue={title} state={state} />
      <FormMessage state={state} />
      <button type="submit" className="secondary" disabled={pending}>Rename</button>
    </ActionForm>
  );
}
