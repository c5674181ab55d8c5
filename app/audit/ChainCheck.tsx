import { checkRecordsLight, checkStoredRecords, lastChainCheck } from "@/lib/services/verify";
import { AnchorStatus } from "./AnchorStatus";
import { ChainCheckButton } from "./ChainCheckButton";
import { formatTime } from "@/lib/display/time";

/**
 * The chain's head, the last full check recorded in the log (the head it verified), and the entries
 * after that head checked on this view (hash, link, signature): the work of a view grows with what was
 * added since the last full check, not with the log. The full check (every entry, signature, record and
 * original file) is the button, which records its result, and `corelag verify`. `?verify=1` runs the
 * full check without recording it.
 */
export async function ChainCheck({ head, verify, zone }: { head: { entries: number; seq: number | null; hash: string | null; at: Date | null }; verify: boolean; zone: string }) {
  const check = verify ? await checkStoredRecords() : null;
  const light = check ? null : await checkRecordsLight();
  const last = await lastChainCheck();
  const t = (iso: string | Date) => formatTime(iso, zone, { seconds: true });
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
        <>
          <p data-testid="chain-last-full">
            {last
              ? last.ok
                ? <>Last full check: {t(last.at)} by {last.actor} (entry #{last.seq}): the chain was intact and signed up to entry #{last.head_seq}, and every record matched.</>
                : <span className="status-fail">Last full check: {t(last.at)} by {last.actor} (entry #{last.seq}) found {last.findings} problem(s); run the full check again, or <code>corelag verify</code>, for the list.</span>
              : <>No full check recorded yet.</>}
          </p>
          {light && (
            <p data-testid="chain-since" className={light.findings.length === 0 ? "status-pass" : "status-fail"}>
              {light.findings.length === 0
                ? <>Checked on this view ({t(light.checked_at)}): {light.from ? <>entry #{light.from.head.seq} still has the hash verified {light.from.source === "log" ? "by that check" : <>by this server at {t(light.from.checked_at)}</>}, {light.entriesChecked === 0 ? "and no entry was added after it." : <>and the {light.entriesChecked} entr{light.entriesChecked === 1 ? "y" : "ies"} after it {light.entriesChecked === 1 ? "is" : "are"} linked and signed.</>}</> : <>all {light.entriesChecked} entries are linked and signed (no earlier verified head to start from).</>}</>
                : <>Checked on this view: {light.findings.length} problem(s): {light.findings.slice(0, 5).map((f) => f.message).join("; ")}{light.findings.length > 5 ? "; …" : ""}. Run the full check.</>}
            </p>
          )}
          <ChainCheckButton zone={zone} />
        </>
      )}
      <AnchorStatus />
      <p className="muted">Each entry carries the SHA-256 of the one before it and of the record it wrote, and is signed with a key kept outside the database; the database refuses edits and deletions. <code>npm run -s corelag -- verify</code> also re-runs every stored review to confirm that it reproduces bit for bit.</p>
    </div>
  );
}
