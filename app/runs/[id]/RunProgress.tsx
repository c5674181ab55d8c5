"use client";

import { useRouter } from "next/navigation";
import { useEffect, useState } from "react";
import type { RunState } from "@/lib/services/runs";

/** Follows a background run by polling its state; offers cancel; opens the review when it is stored. */
export function RunProgress({ initial, mayCancel }: { initial: RunState; /** the viewer's role may cancel (review:run); others only follow the run */ mayCancel: boolean }) {
  const router = useRouter();
  const [run, setRun] = useState<RunState>(initial);
  const [error, setError] = useState<string | null>(null);
  const [cancelling, setCancelling] = useState(false);

  useEffect(() => {
    if (run.status !== "running") {
      if (run.status === "done" && run.reviewId) router.replace(`/reviews/${run.reviewId}`);
      if (run.status === "done" && run.kind === "shipment" && run.shipmentId) router.replace(`/shipments/${run.shipmentId}`);
      return;
    }
    const timer = setTimeout(async () => {
      try {
        const res = await fetch(`/api/runs/${run.id}`, { cache: "no-store" });
        if (!res.ok) throw new Error((await res.json()).error ?? `HTTP ${res.status}`);
        setRun(await res.json());
      } catch (e) {
        setError(`could not read the run's state: ${(e as Error).message}`);
      }
    }, 500);
    return () => clearTimeout(timer);
  }, [run, router]);

  async function cancel() {
    setCancelling(true);
    const res = await fetch(`/api/runs/${run.id}/cancel`, { method: "POST" });
    const body = await res.json();
    if (res.ok) setRun(body);
    else setError(body.error ?? `HTTP ${res.status}`);
    setCancelling(false);
  }

  const percent = Math.round(run.progress * 100);
  return (
    <section data-testid="run-state" data-status={run.status}>
      {run.status === "running" && (
        <>
          {run.kind === "shipment" ? (
            <p data-testid="shipment-progress">
              <progress max={run.total ?? 1} value={run.done ?? 0} aria-label="Reviews done" /> {run.done ?? 0} of {run.total} logger × product reviews done
            </p>
          ) : (
            <p>
              <progress max={100} value={percent} aria-label="Monte Carlo samples done" /> {percent} % of the Monte Carlo samples
            </p>
          )}
          {mayCancel && (
            <button type="button" onClick={cancel} disabled={cancelling}>
              {cancelling ? "Cancelling…" : "Cancel this run"}
            </button>
          )}
        </>
      )}
      {run.status === "done" && <p>Done: opening the {run.kind === "shipment" ? "shipment" : "review"}…</p>}
      {run.status === "cancelled" && <p>Cancelled. Nothing was stored; the audit log records the cancellation.</p>}
      {run.status === "failed" && <p className="error">The run failed and stored nothing: {run.message}</p>}
      {error && <p className="error">{error}</p>}
    </section>
  );
}
