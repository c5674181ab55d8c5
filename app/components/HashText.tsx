"use client";

import { useState } from "react";

/**
 * A SHA-256 shown short enough for a table column ("9282415dda38…"), the whole value on hover and one
 * click from the clipboard, so that a long hash never widens its table past its card.
 */
export function HashText({ hash, title, shown = 12, testId }: { hash: string; title?: string; shown?: number; testId?: string }) {
  const [copied, setCopied] = useState<null | "yes" | "no">(null);
  return (
    <span className="hash-text">
      <code className="hash" title={title ?? hash} data-testid={testId} data-full={hash}>
        {hash.length > shown ? `${hash.slice(0, shown)}…` : hash}
      </code>
      <button
        type="button"
        className="copy no-print"
        aria-label="copy the full hash"
        title={copied === "yes" ? "copied" : copied === "no" ? "the browser refused the clipboard: select the text in the details instead" : `copy ${hash}`}
        onClick={() =>
          navigator.clipboard.writeText(hash).then(
            () => setCopied("yes"),
            () => setCopied("no"),
          )
        }
      >
        {copied === "yes" ? "copied" : "copy"}
      </button>
    </span>
  );
}
