import { verifyReviewRecord } from "@/lib/services/verify";
import { shortFingerprint } from "@/lib/review/signature";

import { formatTime } from "@/lib/display/time";

/**
 * "Verified at TIME against chain head N, key FINGERPRINT": this review, its trace and its definitions
 * compared with the signed audit chain as the page is rendered (no engine re-run; that is the re-check).
 * The light check (lib/services/verify.ts verifyReviewRecord): the chain only after its last verified
 * head, the trace without its original bytes (loaded only for download and the re-check).
 * On the printed report it also states the chain's head at printing time, in full.
 */
export async function RecordVerified({ review, printing = false, zone = "UTC" }: { review: { id: string; traceId: string; productId: string; packId: string | null; limitsId: string }; printing?: boolean; zone?: string }) {
  const utc = (iso: string) => formatTime(iso, zone, { seconds: true });
  const v = await verifyReviewRecord({ reviewId: review.id, traceId: review.traceId, productId: review.productId, packId: review.packId, limitsId: review.limitsId });
  const head = v.head;
  const key = head?.key_fingerprint ?? v.key.chain;
  const against = head ? <>chain head {head.seq}, key <code className="hash" title={key ?? undefined}>{key ? shortFingerprint(key) : "none"}</code></> : <>an empty chain</>;
  return (
    <div data-testid="record-verified">
      {v.ok ? (
        <p className="status-pass" data-testid="record-verified-line">Record verified at {utc(v.checked_at)} against {against}.</p>
      ) : (
        <div className="status-fail" data-testid="record-verified-line">
          <p>Record check FAILED at {utc(v.checked_at)} against {against}: this review or its inputs no longer match the signed audit chain.</p>
          <ul data-testid="record-findings">
            {v.findings.slice(0, 10).map((f, i) => (
              <li key={i}><code>{f.kind}</code>: {f.message}</li>
            ))}
            {v.findings.length > 10 && <li>… and {v.findings.length - 10} more (run <code>corelag verify</code>)</li>}
          </ul>
        </div>
      )}
      <p className="muted" data-testid="record-verified-scope">
        {v.full
          ? <>Checked against the whole chain, with the original logger file against its SHA-256.</>
          : <>Checked on this view: this review, its trace and definitions against their latest entries, and the chain {v.from ? <>after entry #{v.from.head.seq} (verified {v.from.source === "log" ? <>by the full check of {utc(v.from.checked_at)}</> : <>by this server at {utc(v.from.checked_at)}</>})</> : <>from its first entry</>}. The original logger file is compared with its SHA-256 by <em>Re-check this review</em> and <code>corelag verify</code>.</>}
      </p>
      {printing && head && (
        <p className="muted" data-testid="report-chain-head">
          Audit chain head at printing: entry {head.seq}, hash <code className="hash">{head.hash}</code>, signed by key <code className="hash">{key}</code>.
        </p>
      )}
    </div>
  );
}
