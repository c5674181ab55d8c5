"use client";

import Link from "next/link";
import { useActionState } from "react";
import { recheckReviewAction, type RecheckState } from "@/app/actions/recheck";
import { formatTime } from "@/lib/display/time";

interface LastCheck { seq: number; at: string; reproduced: boolean }


/**
 * Re-imports the stored original bytes with the recorded settings and re-runs the engine on the recorded
 * definition versions, as `corelag verify --review` does; the result is shown and recorded in the audit log.
 */
export function RecheckButton({ reviewId, last, zone }: { reviewId: string; last: LastCheck | null; zone: string }) {
  const [state, action, pending] = useActionState<RecheckState, FormData>(recheckReviewAction, {});
  const r = state.result;
  return (
    <form action={action} aria-label="Re-check this review" data-testid="recheck">
      <input type="hidden" name="reviewId" value={reviewId} />
      <p style={{ marginTop: 0 }}>
        Re-import the original logger file with the recorded settings and re-run the engine on the recorded definitions, to confirm this record reproduces bit for bit.
      </p>
      <button type="submit" className="secondary" disabled={pending}>{pending ? "Re-checking…" : "Re-check this review"}</button>
      {state.message && <p className="form-error" data-testid="recheck-error">{state.message}</p>}
      {r && (
        <div data-testid="recheck-result" role="status">
          <p className={r.reproduced ? "status-pass" : "status-fail"}>
            <strong>{r.reproduced ? "Reproduced" : "Did not reproduce"}</strong>{r.reproduced ? ": same trace series, same definitions, same result hash" : ""} ({formatTime(r.at, zone, { seconds: true })}, recorded as <Link href={`/audit?object=${reviewId}&action=verify`}>audit entry #{r.seq}</Link>).
          </p>
          {r.problems.length > 0 && <ul data-testid="recheck-problems">{r.problems.map((p) => <li key={p}>{p}</li>)}</ul>}
        </div>
      )}
      {!r && last && (
        <p className="muted" data-testid="recheck-last">
          Last re-checked {formatTime(last.at, zone, { seconds: true })}: {last.reproduced ? "reproduced" : "did not reproduce"} (<Link href={`/audit?object=${reviewId}&action=verify`}>audit entry #{last.seq}</Link>).
        </p>
      )}
    </form>
  );
}
