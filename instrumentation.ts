// Runs once when a server instance starts: on PostgreSQL the instance starts taking queued review and shipment
// runs (lib/services/runs.ts), so a run any instance accepted is computed even if that instance is gone; on
// either database the monitor sweep starts, which also resumes alert deliveries a stopped process left due.
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { startRunWorkers } = await import("./lib/services/runs");
  await startRunWorkers();
  const { ensureSweeper } = await import("./lib/services/monitors");
  ensureSweeper();
}
