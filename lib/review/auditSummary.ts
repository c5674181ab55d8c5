/** Why a sign-in was refused (lib/services/access.ts), in words. */
const SIGN_IN_REASONS: Record<string, string> = {
  "wrong-password": "wrong password",
  "unknown-email": "no account has this address",
  locked: "account locked after repeated failures",
  "address-locked": "address locked after repeated failures",
  disabled: "account disabled",
};

/**
 * One line saying what an audit entry recorded, from its details, for the audit page ("decision hold
 * (suggested reject)"). The full details stay one click away; unknown shapes give an empty line.
 */
export function auditSummary(action: string, details: unknown): string {
  const d = (details && typeof details === "object" ? details : {}) as Record<string, unknown>;
  const s = (k: string) => (typeof d[k] === "string" || typeof d[k] === "number" ? String(d[k]) : null);
  const short = (h: string | null) => (h ? `${h.slice(0, 12)}…` : null);
  const parts: Array<string | null> = (() => {
    switch (action) {
      case "import":
        return [s("fileName"), s("samples") && `${s("samples")} samples`, short(s("sha256")) && `SHA-256 ${short(s("sha256"))}`];
      case "create":
      case "edit":
        return [s("kind"), s("version") && `version ${s("version")}`, s("role") && `role ${s("role")}`];
      case "run":
        return [s("outcome") && `suggested ${s("outcome")}`, s("engineVersion") && `engine ${s("engineVersion")}`, s("corrects") && `corrects ${s("corrects")}`];
      case "sign":
        return [s("decision") && `decision ${s("decision")}${s("suggested") ? ` (suggested ${s("suggested")})` : ""}`];
      case "rename":
        return [s("from") && s("to") && `“${s("from")}” → “${s("to")}”`];
      case "export":
        return [short(s("sha256")) && `SHA-256 ${short(s("sha256"))}`];
      case "verify": {
        const problems = Array.isArray(d.problems) ? d.problems.length : 0;
        return [d.reproduced === true ? "reproduced" : d.reproduced === false ? `${problems} problem(s)` : null];
      }
      case "readings":
        return [s("accepted") && `${s("accepted")} reading(s)`, d.duplicates ? `${s("duplicates")} duplicate(s)` : null, d.conflicts ? `${s("conflicts")} conflict(s)` : null, short(s("sha256")) && `SHA-256 ${short(s("sha256"))}`];
      case "raise":
      case "clear":
        return [s("key")];
      case "deliver":
        return [s("channel") && s("target") && `${s("event")} by ${s("channel")} to ${s("target")}, attempt ${s("attempt")}: ${d.ok === true ? "delivered" : `failed${s("error") ? ` (${s("error")})` : ""}`}`];
      case "sign-in":
        return [s("address") && `from ${s("address")}`];
      case "sign-in-refused":
        return [s("reason") && `refused: ${SIGN_IN_REASONS[s("reason")!] ?? s("reason")}`, s("address") && `from ${s("address")}`];
      case "set-role":
        return [s("from") && s("to") && `role ${s("from")} → ${s("to")}`];
      case "close":
        return [s("reviewId") && `review ${s("reviewId")}`];
      default:
        return [];
    }
  })();
  return parts.filter((p): p is string => !!p).join(", ");
}
