import { db } from "./client";
import { appendAudit } from "./audit";

/** Records that a background run was cancelled and stored nothing. */
export async function logRunCancelled(runId: string, actor: string, details: { kind: string; title: string; progress: number; requested_at: string }): Promise<void> {
  await db.$transaction((tx) => appendAudit(tx, { action: "cancel", entity: "run", entityId: runId, actor, details }));
}
