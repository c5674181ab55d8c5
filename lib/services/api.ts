// What the /api/v1 handlers call: each function takes validated input and the acting user or token,
// calls the same services the pages and the CLI use, and answers the API's JSON shape or a problem.
// Nothing here knows HTTP beyond the problem statuses.
import type { z } from "zod";
import pkg from "../../package.json";
import type { Actor } from "../access/actor";
import { problem, validationProblem, type Problem } from "../api/problem";
import { definitionBodySchemas, type ApiDefinitionKind, type ReviewRequest, type reviewSchema, type signOffRequestSchema, type reviewListQuerySchema, type auditPageSchema, type healthSchema, type runSchema, type traceCreatedSchema, type traceSchema, type definitionCreatedSchema, type reviewSummarySchema } from "../api/schemas";
import { ENGINE_VERSION } from "../review/runReview";
import type { ImportOptions } from "../trace/settings";
import { sha256Hex } from "../trace/hash";
import { databaseUrl } from "../db/env";
import { getTrace, getTraceOriginal } from "../db/traces";
import { createDefinition, getDefinition, reviseDefinition } from "../db/definitions";
import { getReview, type StoredReview } from "../db/reviews";
import { logOriginalDownload } from "../db/audit";
import { auditAfter, reviewsAfter } from "../db/apiQueries";
import { isDiskFull } from "../db/errors";
import { importAndStoreTrace } from "./traces";
import { signReviewWithPassword } from "./signature";
import { startReviewRun, waitForRun, getRun, type RunState } from "./runs";

export type Answer<T> = { ok: true; value: T } | { ok: false; problem: Problem };
const refuse = (p: Problem): { ok: false; problem: Problem } => ({ ok: false, problem: p });
const iso = (d: Date) => d.toISOString();
const diskFull = () => problem("storage-full", "the server's disk is full, so nothing was stored; free some space (or ask the administrator to) and send the request again");

/** "sqlite" or "postgresql", from the scheme of DATABASE_URL. */
export function databaseKind(url: string): "sqlite" | "postgresql" {
  return /^postgres(ql)?:/i.test(url) ? "postgresql" : "sqlite";
}

export function health(): z.infer<typeof healthSchema> {
  return { status: "ok", version: pkg.version, engine_version: ENGINE_VERSION, database: databaseKind(databaseUrl()) };
}

// --- traces -----------------------------------------------------------------------------------------

export async function importTraceFromApi(
  bytes: Uint8Array,
  req: { fileName: string; name?: string; options: ImportOptions },
  actor: Actor,
): Promise<Answer<z.infer<typeof traceCreatedSchema>>> {
  const res = await importAndStoreTrace(bytes, { name: req.name, fileName: req.fileName, options: req.options }, actor);
  if (!res.ok) {
    if (res.diskFull) return refuse(diskFull());
    if (res.busy) return refuse(problem("busy", res.message));
    if (res.field === "fileName" || res.field === "name") return refuse(problem("invalid-request", res.message, { field: res.field === "fileName" ? "file_name" : "name" }));
    return refuse(problem("invalid-file", res.message, { row: res.row, column: res.column }));
  }
  const t = await getTrace(res.traceId);
  const m = t!.meta;
  return { ok: true, value: { id: m.id, sha256: m.sha256, samples: m.sampleCount, start: iso(m.startAt), end: iso(m.endAt), warnings: m.warnings } };
}

export async function traceForApi(id: string): Promise<Answer<z.infer<typeof traceSchema>>> {
  const t = await getTrace(id);
  if (!t) return refuse(problem("not-found", `there is no trace with id '${id}'`, { field: "id" }));
  const m = t.meta;
  return {
    ok: true,
    value: {
      id: m.id, name: m.name, file_name: m.fileName, sha256: m.sha256, samples: m.sampleCount, start: iso(m.startAt), end: iso(m.endAt),
      warnings: m.warnings, has_probe: m.hasProbe, import_settings: m.importSettings as unknown as Record<string, unknown>, created_at: iso(m.createdAt),
    },
  };
}

/** The stored bytes, with the download recorded in the audit log under the actor. */
export async function traceOriginalForApi(id: string, actor: Actor): Promise<Answer<{ bytes: Uint8Array; fileName: string; sha256: string; recordedSha256: string }>> {
  const original = await getTraceOriginal(id);
  if (!original) return refuse(problem("not-found", `there is no trace with id '${id}'`, { field: "id" }));
  const sha256 = sha256Hex(original.bytes);
  await logOriginalDownload(id, sha256, actor);
  return { ok: true, value: { bytes: original.bytes, fileName: original.fileName, sha256, recordedSha256: original.sha256 } };
}

// --- definitions ------------------------------------------------------------------------------------

type DefinitionCreated = z.infer<typeof definitionCreatedSchema>;

/** Validates a definition body (the JSON the CLI reads) and stores it as a new definition, or a new version of `id`'s. */
export async function storeDefinitionFromApi(kind: ApiDefinitionKind, body: unknown, actor: Actor, reviseId?: string): Promise<Answer<DefinitionCreated>> {
  let lineage: string | undefined;
  if (reviseId !== undefined) {
    const current = await getDefinition(reviseId);
    if (!current || current.kind !== kind) return refuse(problem("not-found", `there is no ${kind} definition with id '${reviseId}'`, { field: "id" }));
    lineage = current.lineage;
  }
  const parsed = (definitionBodySchemas[kind] as z.ZodType<{ name: string }>).safeParse(body);
  if (!parsed.success) return refuse(validationProblem(parsed.error));
  try {
    const d = lineage ? await reviseDefinition(lineage, parsed.data, actor) : await createDefinition(kind, parsed.data, actor);
    return { ok: true, value: { id: d.id, version: d.version, sha256: d.sha256, kind, lineage: d.lineage, name: d.name } };
  } catch (e) {
    if (isDiskFull(e)) return refuse(diskFull());
    throw e;
  }
}

// --- reviews ----------------------------------------------------------------------------------------

type ReviewJson = z.infer<typeof reviewSchema>;

/** The stored review as the API shows it: the CLI's result JSON with the record's identity and signature. */
export function reviewJson(r: StoredReview): ReviewJson {
  return {
    id: r.id,
    status: r.status as "open" | "signed",
    result_sha256: r.resultSha256,
    title: r.title,
    created_at: iso(r.createdAt),
    trace: { id: r.trace.id, name: r.trace.name, sha256: r.trace.sha256, samples: r.trace.sampleCount },
    product_id: r.productId,
    pack_id: r.packId,
    limits_id: r.limitsId,
    corrects_id: r.correctsId,
    signature:
      r.status === "signed" && r.decision && r.signedAt
        ? { decision: r.decision as "accept" | "hold" | "reject", signed_by: r.signedBy ?? "", signed_at: iso(r.signedAt), meaning: r.signMeaning, comment: r.signComment }
        : null,
    ...r.result,
  };
}

export async function reviewForApi(id: string): Promise<Answer<ReviewJson>> {
  const r = await getReview(id);
  if (!r) return refuse(problem("not-found", `there is no review with id '${id}'`, { field: "id" }));
  return { ok: true, value: reviewJson(r) };
}

/** The service's field names → the API's. */
const API_FIELD: Record<string, string | undefined> = {
  traceId: "trace_id", productId: "product_id", packId: "pack_id", limitsId: "limits_id", model: "model", windowStart: "window", windowEnd: "window", title: "title",
};

/** How long POST /reviews waits for a run before answering 202 with the run to follow. */
export const REVIEW_WAIT_MS = 10_000;

const runJson = (r: RunState): z.infer<typeof runSchema> => ({
  run_id: r.id, status: r.status, progress: r.progress, review_id: r.reviewId ?? null, message: r.message ?? null, started_at: r.started_at, finished_at: r.finished_at ?? null,
});

export type ReviewStarted = { kind: "stored"; review: ReviewJson } | { kind: "running"; run: z.infer<typeof runSchema> };

export async function runReviewFromApi(req: ReviewRequest, actor: Actor, waitMs = REVIEW_WAIT_MS): Promise<Answer<ReviewStarted>> {
  let windowStart: string | undefined, windowEnd: string | undefined;
  if (req.window) [windowStart, windowEnd] = req.window.split("/");
  let title = req.title;
  if (!title) {
    const [trace, product] = await Promise.all([getTrace(req.trace_id), getDefinition<{ name: string }>(req.product_id)]);
    title = trace && product ? `${product.name} on ${trace.meta.name}` : "review";
  }
  const started = await startReviewRun(
    { title, traceId: req.trace_id, productId: req.product_id, packId: req.pack_id, limitsId: req.limits_id, model: req.model, windowStart, windowEnd },
    actor,
  ).catch((e: unknown) => {
    // the request schema refused what the API schema let through (the window's date-times)
    if (e && typeof e === "object" && "issues" in e) return { ok: false as const, field: String((e as z.ZodError).issues[0]!.path[0]), message: (e as z.ZodError).issues[0]!.message };
    throw e;
  });
  if (!started.ok) {
    const field = API_FIELD[started.field];
    const notFound = / does not exist$/.test(started.message) && field !== undefined;
    return refuse(problem(notFound ? "not-found" : "invalid-request", field ? `body field '${field}': ${started.message}` : started.message, field ? { field } : {}));
  }
  // waitMs 0 (Prefer: respond-async) answers with the run as it started, even when a short run has already ended
  const run = waitMs > 0 ? ((await waitForRun(started.run.id, waitMs)) ?? started.run) : started.run;
  if (run.status === "done" && run.reviewId) return { ok: true, value: { kind: "stored", review: reviewJson((await getReview(run.reviewId))!) } };
  if (run.status === "failed") return refuse(problem("invalid-request", run.message ?? "the run failed"));
  return { ok: true, value: { kind: "running", run: runJson(run) } };
}

export async function runForApi(id: string): Promise<Answer<z.infer<typeof runSchema>>> {
  const r = await getRun(id);
  if (!r) return refuse(problem("not-found", `there is no run '${id}' in this server (runs are forgotten an hour after they end, or when the server restarts)`, { field: "id" }));
  return { ok: true, value: runJson(r) };
}

export async function listReviewsForApi(q: z.infer<typeof reviewListQuerySchema>): Promise<Answer<{ items: z.infer<typeof reviewSummarySchema>[]; next_after: string | null }>> {
  const page = await reviewsAfter({ status: q.status, outcome: q.outcome }, q.after, q.limit ?? 50);
  if (!page.ok) return refuse(problem("invalid-request", `query parameter 'after': there is no review '${q.after}' to continue after`, { field: "after" }));
  const items = page.rows.map((r) => ({
    id: r.id, title: r.title, status: r.status as "open" | "signed", outcome: r.outcome as "accept" | "hold" | "reject", decision: r.decision as "accept" | "hold" | "reject" | null,
    created_at: iso(r.createdAt), trace_id: r.traceId, product_id: r.productId, limits_id: r.limitsId, result_sha256: r.resultSha256,
  }));
  return { ok: true, value: { items, next_after: page.more ? items[items.length - 1]!.id : null } };
}

// --- audit ------------------------------------------------------------------------------------------

export async function auditForApi(after: number, limit: number): Promise<z.infer<typeof auditPageSchema>> {
  const page = await auditAfter(after, limit);
  const entries = page.entries.map((e) => ({ seq: e.seq, at: iso(e.at), action: e.action, entity: e.entity, entity_id: e.entityId, actor: e.actor, details: e.details, prev_hash: e.prevHash, hash: e.hash }));
  return { entries, next_after: page.more ? entries[entries.length - 1]!.seq : null };
}

// --- sign-off ---------------------------------------------------------------------------------------

/**
 * A signature through the API, with the same service as the review page (lib/services/signature.ts): the
 * token names the signer (its owner) and the owner's password, re-entered in the body, is the second
 * component (two distinct identification components, as in 21 CFR Part 11 §11.200); the stored inputs
 * must still reproduce the review; a limit set's second-person rule holds. A token alone cannot sign.
 */
export async function signOffFromApi(id: string, body: z.infer<typeof signOffRequestSchema>, actor: Actor): Promise<Answer<ReviewJson>> {
  if (!(await getReview(id))) return refuse(problem("not-found", `there is no review with id '${id}'`, { field: "id" }));
  const res = await signReviewWithPassword(id, body, actor, { tokenWithOwnerPassword: true });
  if (!res.ok) {
    switch (res.reason) {
      case "not-found":
        return refuse(problem("not-found", res.message, { field: "id" }));
      case "not-a-user":
        return refuse(problem("forbidden", res.message));
      case "signed":
      case "not-reproduced":
        return refuse(problem("conflict", res.message));
      case "password":
        return refuse(problem("signature-refused", `the password does not match ${actor.kind === "token" ? "the token owner's" : "yours"}; nothing was signed`, { field: "password" }));
      default:
        return refuse(problem("signature-refused", res.message, res.field ? { field: res.field } : {}));
    }
  }
  return reviewForApi(id);
}
