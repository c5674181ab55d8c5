import Link from "next/link";
import { checkStoredRecords } from "@/lib/services/verify";
import { AnchorStatus } from "./AnchorStatus";
import { formatTime } from "@/lib/display/time";

/**
 * The chain's head (cheap: a count and the newest hash) and, only when asked, the full check that
 * `corelag verify` makes without re-running reviews: every entry's hash, link and signature, and every
 * record against its latest entry. Doing that on every view would grow with the log.
 */
export async function ChainCheck({ head, verify, zone }: { head: { entries: number; seq: number | null; hash: string | null; at: Date | null }; verify: boolean; zone: string }) {
  const check = verify ? await checkStoredRecords() : null;
  return (
    <div data-testid="chain-check">
      <p data-testid="chain-head">
        {head.entries} entries; newest #{head.seq ?? "–"}
        {head.at && <> at {formatTime(head.at, zone, { seconds: true })}</>}
        {head.hash && <>, hash <code className="hash">{head.hash}</code></>}
      </p>
      {check ? (
        check.findings.length === 0 ? (
          <p data-testid="chain-status" className="status-pass">
            Re-checked just now ({formatTime(check.checked_at, zone, { seconds: true })}): the chain is intact and signed, and every trace, definition and review matches its latest entry.
          </p>
        ) : (
          <div data-testid="chain-status" className="status-fail">
            <p>Re-checked just now: {check.findings.length} problem(s).</p>
            <ul>{check.findings.slice(0, 50).map((f, i) => <li key={i}>{f.message}</li>)}</ul>
            {check.findings.length > 50 && <p>and {check.findings.length - 50} more (run <code>corelag verify</code> for all)</p>}
          </div>
        )
      ) : (
        <p className="no-print"><Link href="/audit?verify=1" data-testid="verify-chain">Re-check the whole chain now</Link> <span className="muted">(re-hashes every entry and checks every signature and record)</span></p>
      )}
      <AnchorStatus />
      <p className="muted">Each entry carries the SHA-256 of the one before it and of the record it wrote, and is signed with a key kept outside the database; the database refuses edits and deletions. <code>npm run -s corelag -- verify</code> also re-runs every stored review to confirm that it reproduces bit for bit.</p>
    </div>
  );
}
