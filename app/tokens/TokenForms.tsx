"use client";

import { useActionState } from "react";
import { ActionForm } from "@/app/components/ActionForm";
import { createTokenAction, revokeTokenAction, type TokenFormState } from "@/app/actions/tokens";
import type { FormState } from "@/lib/validation";

export function CreateTokenForm({ owners, monitors }: { owners: Array<{ email: string; label: string }>; monitors: Array<{ id: string; label: string }> }) {
  const [state, dispatch, pending] = useActionState<TokenFormState, FormData>(createTokenAction, {});
  const v = state.values ?? {};
  const err = state.fieldErrors ?? {};
  return (
    <>
      {state.created ? (
        <div className="caution" data-testid="new-token">
          <p><strong>Copy this token now: it is not shown again.</strong> Owner {state.created.owner}, scope {state.created.scope}, {state.created.expires_at ? `expires ${state.created.expires_at.slice(0, 16).replace("T", " ")} UTC` : "does not expire"}.</p>
          <p><code className="hash" data-testid="token-value">{state.created.token}</code></p>
        </div>
      ) : null}
      {state.message ? <p className="form-error">{state.message}</p> : null}
      {/* a new form after each token made (keyed by its id), so a second click cannot make a duplicate by mistake */}
      <ActionForm action={dispatch} className="stack" key={state.created?.id ?? "form"}>
        <label>
          Owner
          <select name="email" defaultValue={v.email ?? ""} aria-invalid={err.email ? true : undefined} key={`email-${v.email ?? ""}`}>
            <option value="">Choose a user</option>
            {owners.map((o) => <option key={o.email} value={o.email}>{o.label}</option>)}
          </select>
          {err.email ? <span className="field-error">{err.email}</span> : null}
        </label>
        <label>
          Name (what it is for)
          <input name="name" defaultValue={v.name ?? ""} placeholder="warehouse gateway" aria-invalid={err.name ? true : undefined} />
          {err.name ? <span className="field-error">{err.name}</span> : null}
        </label>
        <label>
          Scope
          <select name="scope" defaultValue={v.scope ?? "read"} key={`scope-${v.scope ?? ""}`}>
            <option value="read">read: GET only</option>
            <option value="write">write: what the owner&apos;s role allows</option>
            <option value="device">device: post readings only</option>
          </select>
        </label>
        <label>
          Monitor (device tokens only: the one monitor it may post readings to)
          <select name="monitorId" defaultValue={v.monitorId ?? ""} aria-invalid={err.monitorId ? true : undefined} key={`monitor-${v.monitorId ?? ""}`} data-testid="token-monitor">
            <option value="">none (read and write tokens)</option>
            {monitors.map((m) => <option key={m.id} value={m.id}>{m.label}</option>)}
          </select>
          {err.monitorId ? <span className="field-error" data-testid="error-monitorId">{err.monitorId}</span> : null}
        </label>
        <label>
          Expires after (days, blank: until revoked)
          <input name="expiresDays" inputMode="numeric" defaultValue={v.expiresDays ?? "90"} aria-invalid={err.expiresDays ? true : undefined} />
          {err.expiresDays ? <span className="field-error">{err.expiresDays}</span> : null}
        </label>
        <button type="submit" disabled={pending}>{pending ? "Making…" : "Make token"}</button>
      </ActionForm>
    </>
  );
}

export function RevokeTokenButton({ id, name }: { id: string; name: string }) {
  const [state, dispatch, pending] = useActionState<FormState, FormData>(revokeTokenAction, {});
  return (
    <ActionForm action={dispatch}>
      <input type="hidden" name="id" value={id} />
      <button type="submit" className="secondary" disabled={pending} aria-label={`Revoke ${name}`}>{pending ? "Revoking…" : "Revoke"}</button>
      {state.message ? <span className="muted"> {state.message}</span> : null}
    </ActionForm>
  );
}
