"use client";

import { useEffect, useState } from "react";

/** How often the badge asks for the count, ms: alerts are minutes apart, so a few seconds is prompt enough. */
const POLL_MS = 5_000;

export function LiveAlertBadge({ initial }: { initial: number }) {
  const [n, setN] = useState(initial);
  useEffect(() => {
    let stopped = false;
    const tick = async () => {
      try {
        const res = await fetch("/monitors/badge", { cache: "no-store" });
        if (res.ok && !stopped) setN(((await res.json()) as { open: number }).open);
      } catch {
        // offline for a moment: keep the last count, the next tick tries again
      }
    };
    const t = setInterval(tick, POLL_MS);
    return () => {
      stopped = true;
      clearInterval(t);
    };
  }, []);
  if (n === 0) return null;
  return (
    <span className="nav-badge" data-testid="alert-badge" aria-label={`${n} open alert${n === 1 ? "" : "s"}`}>
      {n}
    </span>
  );
}
