// A local log of the anchors `corelag anchor` printed (one JSON line each, beside the database), so the
// audit page can show the last one and whether the chain still contains it. The anchors that count are
// the copies kept outside this machine; this log is a convenience and is not trusted by verify.
import { appendFileSync, existsSync, mkdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { localStateBase } from "./env";
import { anchorSchema, type Anchor } from "../review/anchor";

export const anchorLogFile = () => `${localStateBase()}.anchors.jsonl`;

export function recordAnchor(a: Anchor): void {
  mkdirSync(path.dirname(anchorLogFile()), { recursive: true });
  appendFileSync(anchorLogFile(), JSON.stringify(a) + "\n", { mode: 0o600 });
}

/** The newest well-formed anchor in the log, or null. */
export function lastRecordedAnchor(): Anchor | null {
  const file = anchorLogFile();
  if (!existsSync(file)) return null;
  const lines = readFileSync(file, "utf8").split("\n").filter((l) => l.trim() !== "");
  for (let i = lines.length - 1; i >= 0; i--) {
    try {
      const parsed = anchorSchema.safeParse(JSON.parse(lines[i]!));
      if (parsed.success) return parsed.data;
    } catch {
      // a damaged line: look at the one before
    }
  }
  return null;
}
