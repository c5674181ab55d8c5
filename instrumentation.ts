// Runs once when a server instance starts: on PostgreSQL the instance starts taking queued review runs
// (lib/services/runs.ts), so a run any instance accepted is computed even if that instance is gone.
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { startRunWorkers } = await import("./lib/services/runs");
  await startRunWorkers();
}
