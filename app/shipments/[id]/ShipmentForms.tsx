"use client";

import { useActionState, useState } from "react";
import { runShipmentAction, signShipmentAction } from "@/app/actions/shipments";
import { ActionForm } from "@/app/components/ActionForm";
import { FormMessage } from "@/app/components/Field";
import type { FormState } from "@/lib/validation";

type Decision = "accept" | "hold" | "reject";

export function RunShipmentButton({ shipmentId, again }: { shipmentId: string; again: boolean }) {
  const [state, action, pending] = useActionState<FormState, FormData>(runShipmentAction, {});
  return (
    <ActionForm action={action} aria-label="Run the shipment review">
      <input type="hidden" name="shipmentId" value={shipmentId} />
      <FormMessage state={state} />
      <button type="submit" disabled={pending} data-testid="run-shipment">{pending ? "Starting…" : again ? "Run the shipment review again" : "Run the shipment review"}</button>
    </ActionForm>
  );
}

/** One sign-off for the load: signs the shipment and every review of its latest run. */
export function ShipmentSignOff({ shipmentId, suggested, reviews, signer }: { shipmentId: string; suggested: Decision; reviews: number; signer: { name: string; email: string } }) {
  const [state, action, pending] = useActionState<FormState, FormData>(signShipmentAction, {});
  const [password, setPassword] = useState("");
  const [decision, setDecision] = useState<Decision>(suggested);
  const [comment, setComment] = useState("");
  return (
    <ActionForm action={action} className="stack" aria-label="Sign off the shipment">
      <input type="hidden" name="shipmentId" value={shipmentId} />
      <p data-testid="signing-as">Signing as <strong>{signer.name}</strong> ({signer.email})</p>
      <label htmlFor="s-decision">
        Decision for the whole load
        <select id="s-decision" name="decision" value={decision} onChange={(e) => setDecision(e.target.value as Decision)}>
          <option value="accept">accept</option>
          <option value="hold">hold for review</option>
          <option value="reject">reject</option>
        </select>
      </label>
      <label htmlFor="s-comment">
        Comment {decision !== suggested ? "(required: the decision differs from the suggested outcome)" : "(optional)"}
        <textarea id="s-comment" name="comment" rows={3} value={comment} onChange={(e) => setComment(e.target.value)} aria-invalid={state.fieldErrors?.comment ? true : undefined} />
        {state.fieldErrors?.comment && <span className="field-error" data-testid="error-comment">{state.fieldErrors.comment}</span>}
      </label>
      <label htmlFor="s-password">
        Your password
        <span className="hint">Re-enter it to sign: your signature is your account and your password together</span>
        <input id="s-password" name="password" type="password" autoComplete="current-password" value={password} onChange={(e) => setPassword(e.target.value)} aria-invalid={state.fieldErrors?.password ? true : undefined} />
        {state.fieldErrors?.password && <span className="field-error" data-testid="error-password">{state.fieldErrors.password}</span>}
      </label>
      <FormMessage state={state} />
      <p className="hint muted">Each review is re-checked first: if any no longer reproduces from its stored inputs, or its limit set asks for a second person and you ran it, nothing is signed. Signing off is final: it signs the shipment and each of its {reviews} reviews with this decision, and none of them can change afterwards.</p>
      <button type="submit" disabled={pending} data-testid="sign-shipment">{pending ? "Signing…" : "Sign off the shipment"}</button>
    </ActionForm>
  );
}
