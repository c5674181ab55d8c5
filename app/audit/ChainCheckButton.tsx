"use client";

import { useActionState } from "react";
import { ActionForm } from "@/app/components/ActionForm";
import { recordChainCheckAction, type ChainCheckState } from "@/app/actions/chainCheck";
import { formatTime } from "@/lib/display/time";

/** The full re-check of the chain, recorded in the log; its result is shown here at once. */
export function ChainCheckButton({ zone }: { zone: string }) {
  const [state, action, pending] = useActionState<ChainCheckState, FormData>(recordChainCheckAction, {});
  const r = state.result;
  return (
    <ActionForm action={action} aria-label="Re-check the whole chain" className="no-print">
      <p>
        <button type="submit" className="secondary" data-testid="verify-chain" disabled={pending}>{pending ? "Re-checking the whole chain…" : "Re-check the whole chain now"}</button>{" "}
        <span className="muted">(re-hashes every entry, checks every signature, every record and every original file against its SHA-256; the result is recorded in the log, and later views check only the entries after it)</span>
      </p>
      {r && (r.ok ? (
        <p data-testid="chain-status" className="status-pass" role="status">
          Re-checked just now ({formatTime(r.at, zone, { seconds: true })}, recorded as entry #{r.seq}): the chain is intact and signed, and every trace, definition and review matches its latest entry.
        </p>
      ) : (
        <div data-testid="chain-status" className="status-fail" role="status">
          <p>Re-checked just now (recorded as entry #{r.seq}): {r.findings} problem(s).</p>
          <ul>{r.problems.map((p, i) => <li key={i}>{p}</li>)}</ul>
          {r.findings > r.problems.length && <p>and {r.findings - r.problems.length} more (run <code>corelag verify</code> for all)</p>}
        </div>
      ))}
    </ActionForm>
  );
}
