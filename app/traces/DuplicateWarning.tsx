"use client";

import Link from "next/link";
import { useEffect, useState } from "react";
import { formatTime } from "@/lib/display/time";

interface Match { id: string; name: string; fileName: string; createdAt: string }

async function sha256Hex(bytes: ArrayBuffer): Promise<string | null> {
  // crypto.subtle exists only in secure contexts (https, localhost); elsewhere the trace page says it after upload.
  if (!globalThis.crypto?.subtle) return null;
  const d = new Uint8Array(await crypto.subtle.digest("SHA-256", bytes));
  return Array.from(d, (b) => b.toString(16).padStart(2, "0")).join("");
}

/** Warns, before upload, when a stored trace has exactly these bytes, and links to it. Uploading again stays possible. */
export function DuplicateWarning({ bytes }: { bytes: ArrayBuffer | null }) {
  const [matches, setMatches] = useState<Match[]>([]);
  useEffect(() => {
    let live = true;
    setMatches([]);
    if (!bytes) return;
    (async () => {
      const sha = await sha256Hex(bytes);
      if (!sha || !live) return;
      const res = await fetch(`/api/traces/by-sha256/${sha}`);
      if (!res.ok || !live) return;
      const body = (await res.json()) as { matches: Match[] };
      if (live) setMatches(body.matches);
    })().catch(() => undefined); // the warning is a courtesy; the trace page lists duplicates after upload too
    return () => {
      live = false;
    };
  }, [bytes]);
  if (matches.length === 0) return null;
  return (
    <p className="caution" data-testid="duplicate-warning">
      This exact file (same SHA-256) is already stored as{" "}
      {matches.map((m, i) => (
        <span key={m.id}>{i > 0 && ", "}<Link href={`/traces/${m.id}`}>{m.name}</Link> ({m.fileName}, uploaded {formatTime(m.createdAt, Intl.DateTimeFormat().resolvedOptions().timeZone)})</span>
      ))}
      . Open it instead, or upload again only if you mean to import it with other settings.
    </p>
  );
}
