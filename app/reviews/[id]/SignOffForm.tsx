"use client";

import { useActionState, useState } from "react";
import { signOffReview, renameReviewAction } from "@/app/actions/reviews";
import { Field, FormMessage } from "@/app/components/Field";
import type { FormState } from "@/lib/validation";

export function SignOffForm({ reviewId, suggested }: { reviewId: string; suggested: "accept" | "hold" | "reject" }) {
  const [state, action, pending] = useActionState<FormState, FormData>(signOffReview, {});
  const [decision, setDecision] = useState<string>(state.values?.decision ?? suggested);
  const commentError = state.fieldErrors?.comment;
  return (
    <form action={action} className="stack" aria-label="Sign off">
      <input type="hidden" name="reviewId" value={reviewId} />
      <input type="hidden" name="suggested" value={suggested} />
      <Field name="reviewer" label="Reviewer" hint="Your name as it should appear on the record" state={state} />
      <label htmlFor="f-decision">
        Decision
        <select id="f-decision" name="decision" value={decision} onChange={(e) => setDecision(e.target.value)}>
          <option value="accept">accept</option>
          <option value="hold">hold for review</option>
          <option value="reject">reject</option>
        </select>
      </label>
      <label htmlFor="f-comment">
        Comment {decision !== suggested ? "(required: the decision differs from the suggested outcome)" : "(optional)"}
        <textarea id="f-comment" name="comment" rows={3} defaultValue={state.values?.comment} aria-invalid={commentError ? true : undefined} />
        {commentError && <span className="field-error" data-testid="error-comment">{commentError}</span>}
      </label>
      <FormMessage state={state} />
      <p className="hint muted">Signing off is final: the review can no longer be edited, and a correction becomes a new review that points back to this one.</p>
      <button type="submit" disabled={pending}>{pending ? "Signing…" : "Sign off"}</button>
    </form>
  );
}

export function RenameForm({ reviewId, title }: { reviewId: string; title: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(renameReviewAction, {});
  return (
    <form action={action} className="stack" aria-label="Rename">
      <input type="hidden" name="reviewId" value={reviewId} />
      <Field name="title" label="Title" defaultValue={title} state={state} />
      <FormMessage state={state} />
      <button type="submit" className="secondary" disabled={pending}>Rename</button>
    </form>
  );
}
