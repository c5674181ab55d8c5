import { lastAnchorStatus } from "@/lib/services/verify";
import { shortFingerprint } from "@/lib/review/signature";

const utc = (iso: string) => `${iso.slice(0, 19).replace("T", " ")} UTC`;

/**
 * The last anchor taken on this machine (`corelag anchor`) and whether the chain still contains it, signed
 * by the same key. Anchors count when kept elsewhere: this line only says whether the newest one still holds.
 */
export async function AnchorStatus() {
  const s = await lastAnchorStatus();
  return (
    <div data-testid="chain-anchor">
      <p data-testid="signing-key">
        Entries are signed with key <code className="hash" title={s.key.chain ?? undefined}>{s.key.chain ? shortFingerprint(s.key.chain) : "none yet"}</code>
        {s.key.local && s.key.chain && s.key.local !== s.key.chain && <strong className="status-fail"> — not this installation&apos;s key ({shortFingerprint(s.key.local)})</strong>}
        .
      </p>
      {s.anchor ? (
        <p data-testid="anchor-status" className={s.contained ? "status-pass" : "status-fail"}>
          Last anchor: entry #{s.anchor.seq} (<code className="hash">{s.anchor.hash.slice(0, 16)}…</code>, key {shortFingerprint(s.anchor.key_fingerprint)})
          {s.anchor.anchored_at && <>, taken {utc(s.anchor.anchored_at)}</>}.{" "}
          {s.contained ? "The chain still contains it." : `The chain no longer contains it: ${s.findings.map((f) => f.message).join("; ")}`}
        </p>
      ) : (
        <p data-testid="anchor-status" className="muted">
          No anchor taken yet. Run <code>npm run -s corelag -- anchor</code> and keep the line it prints outside this machine; <code>corelag verify --anchor</code> then detects removed or rewritten entries.
        </p>
      )}
    </div>
  );
}
