import Link from "next/link";
import { listAudit } from "@/lib/db/audit";
import { verifyAuditChain } from "@/lib/review/audit";
import { AnchorStatus } from "./AnchorStatus";

/**
 * The chain's head (cheap: a count and the newest hash) and, only when asked, a full re-check of every
 * entry's hash and link. Re-hashing the whole log on every view would grow with the log.
 */
export async function ChainCheck({ head, verify }: { head: { entries: number; seq: number | null; hash: string | null; at: Date | null }; verify: boolean }) {
  const check = verify ? verifyAuditChain(await listAudit()) : null;
  return (
    <div data-testid="chain-check">
      <p data-testid="chain-head">
        {head.entries} entries; newest #{head.seq ?? "–"}
        {head.at && <> at {head.at.toISOString().slice(0, 19).replace("T", " ")} UTC</>}
        {head.hash && <>, hash <code className="hash">{head.hash}</code></>}
      </p>
      {check ? (
        <p data-testid="chain-status" className={check.ok ? "status-pass" : "status-fail"}>
          {check.ok ? `Hash chain re-checked just now: intact, ${check.entries} entries.` : `Hash chain broken: ${check.problems.join("; ")}`}
        </p>
      ) : (
        <p className="no-print"><Link href="/audit?verify=1" data-testid="verify-chain">Re-check the whole chain now</Link> <span className="muted">(re-hashes every entry)</span></p>
      )}
      <AnchorStatus />
      <p className="muted">Each entry carries the SHA-256 of the one before it and of the record it wrote, and is signed with a key kept outside the database; the database refuses edits and deletions. <code>npm run -s corelag -- verify</code> also re-runs every stored review to confirm that it reproduces bit for bit.</p>
    </div>
  );
}
