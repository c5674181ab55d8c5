"use server";

import { revalidatePath } from "next/cache";
import { recordChainCheck } from "@/lib/services/verify";
import { guardAction } from "@/app/guard";

export interface ChainCheckState {
  /** a refusal (not signed in) */
  message?: string;
  result?: { ok: boolean; seq: number; at: string; headSeq: number | null; problems: string[]; findings: number };
}

/** "Re-check the whole chain now": the full check, recorded in the log so later views verify only what follows it. */
export const recordChainCheckAction = guardAction("read", async (actor, _prev: ChainCheckState, _form: FormData): Promise<ChainCheckState> => {
  const { report, seq } = await recordChainCheck(actor);
  revalidatePath("/audit");
  return {
    result: { ok: report.findings.length === 0, seq, at: report.checked_at, headSeq: report.head?.seq ?? null, problems: report.findings.slice(0, 50).map((f) => f.message), findings: report.findings.length },
  };
});
