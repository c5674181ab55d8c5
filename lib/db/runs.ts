import { db } from "./client";
import { appendAudit } from "./audit";
import type { Actor } from "../access/actor";

/** Records that a background run was cancelled and stored nothing. */
export async function logRunCancelled(runId: string, actor: Actor, details: { kind: string; title: string; progress: number; requested_at: string }): Promise<void> {
  await db.$transaction((tx) => appendAudit(tx, { action: "cancel", entity: "run", entityId: runId, actor, details }));
}
