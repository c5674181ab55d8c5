// The request and response shapes of /api/v1, as zod schemas. The route handlers validate with these,
// and the OpenAPI document (openapi.ts) is generated from these same objects, so the document cannot
// drift from what the server accepts. Field names are snake_case at this boundary (as in the CLI's JSON);
// times are UTC ISO 8601.
import { z } from "zod";
import { modelChoiceSchema, packSchema, productSchema } from "../thermal/definitions";
import { limitSetSchema } from "../exposure/limits";
import { profileSchema } from "../design/profile";
import { TOKEN_SCOPES } from "../access/roles";
import { createMonitorSchema, MAX_READINGS_PER_BATCH, readingSchema } from "../live";

const id = (what: string) => z.string().min(1, { message: `give the ${what} id` }).max(64, { message: `the ${what} id is longer than 64 characters` });
const isoTime = z.iso.datetime({ offset: true, message: "must be an ISO 8601 date-time with Z or an offset" });
/** a whole number given as a query parameter */
const queryInt = (what: string, min: number, max: number) =>
  z
    .string()
    .regex(/^\d+$/, { message: `${what} must be a whole number` })
    .transform(Number)
    .pipe(z.number().int().min(min, { message: `${what} must be at least ${min}` }).max(max, { message: `${what} must be at most ${max.toLocaleString("en")}` }));

export const problemSchema = z
  .object({
    type: z.string().meta({ description: "stable URI of the kind of problem, e.g. /api/v1/problems/invalid-request" }),
    title: z.string(),
    status: z.number().int(),
    detail: z.string(),
    field: z.string().optional().meta({ description: "the body field (dotted path), query or path parameter at fault" }),
    row: z.number().int().optional().meta({ description: "1-based row of the uploaded file at fault" }),
    column: z.string().optional().meta({ description: "column of the uploaded file at fault" }),
    refused: z.array(z.object({ index: z.number().int(), reason: z.string() })).optional().meta({ description: "invalid-readings: each refused reading by its 0-based index in the request, with the reason" }),
    instance: z.string().optional(),
  })
  .meta({ id: "Problem", description: "RFC 9457 problem details" });

// --- health -----------------------------------------------------------------------------------------
export const healthSchema = z
  .object({
    status: z.literal("ok"),
    version: z.string().meta({ description: "Corelag's version" }),
    engine_version: z.string().meta({ description: "the engine version recorded with every review" }),
    database: z.enum(["sqlite", "postgresql"]),
  })
  .meta({ id: "Health" });

// --- traces -----------------------------------------------------------------------------------------
/**
 * Import options as query parameters, named like the CLI flags without dashes (`--air-col` → `air_col`).
 * Left out, a setting is detected from the file, as in the CLI.
 */
export const traceImportQuerySchema = z
  .strictObject({
    name: z.string().max(160).optional().meta({ description: "a name for the trace (default: the file name)" }),
    file_name: z.string().max(260).optional().meta({ description: "the file's name when the body is raw bytes (default upload.csv)" }),
    sheet: z.string().optional().meta({ description: "--sheet: sheet of an .xlsx workbook" }),
    time_col: z.string().optional().meta({ description: "--time-col" }),
    date_col: z.string().optional().meta({ description: "--date-col" }),
    air_col: z.string().optional().meta({ description: "--air-col" }),
    product_col: z.string().optional().meta({ description: "--product-col" }),
    unit: z.string().optional().meta({ description: "--unit: C, F or K" }),
    tz: z.string().optional().meta({ description: "--tz: IANA zone for times without an offset" }),
    date_order: z.string().optional().meta({ description: "--date-order: dmy, mdy or ymd" }),
    time_format: z.string().optional().meta({ description: "--time-format: datetime, unix-s, unix-ms, elapsed-s, elapsed-min or elapsed-h" }),
    start: z.string().optional().meta({ description: "--start: start of an elapsed-time column, ISO 8601" }),
    decimal: z.string().optional().meta({ description: "--decimal: . or ," }),
    delimiter: z.string().optional().meta({ description: "--delimiter: , ; tab or |" }),
    missing: z.string().optional().meta({ description: "--missing: codes meaning no reading, comma-separated" }),
    plausible_min: z.string().optional().meta({ description: "--plausible-min, °C" }),
    plausible_max: z.string().optional().meta({ description: "--plausible-max, °C" }),
    gap_multiple: z.string().optional().meta({ description: "--gap-multiple" }),
  })
  .meta({ id: "TraceImportQuery" });
export type TraceImportQuery = z.infer<typeof traceImportQuerySchema>;

export const traceCreatedSchema = z
  .object({
    id: z.string(),
    sha256: z.string().meta({ description: "SHA-256 of the stored original bytes" }),
    samples: z.number().int(),
    start: isoTime,
    end: isoTime,
    warnings: z.array(z.string()),
  })
  .meta({ id: "TraceCreated" });

export const traceSchema = z
  .object({
    id: z.string(),
    name: z.string(),
    file_name: z.string(),
    sha256: z.string(),
    samples: z.number().int(),
    start: isoTime,
    end: isoTime,
    warnings: z.array(z.string()),
    has_probe: z.boolean(),
    import_settings: z.record(z.string(), z.unknown()).meta({ description: "the resolved settings; importing the original bytes with them gives the stored series" }),
    created_at: isoTime,
  })
  .meta({ id: "Trace" });

// --- definitions ------------------------------------------------------------------------------------
export const DEFINITION_KINDS = ["product", "pack", "limits", "profile"] as const;
export type ApiDefinitionKind = (typeof DEFINITION_KINDS)[number];
/** The same JSON the CLI reads for each kind (--product, --pack, --limits, --profile). */
export const definitionBodySchemas = {
  product: productSchema,
  pack: packSchema,
  limits: limitSetSchema,
  profile: profileSchema,
} as const satisfies Record<ApiDefinitionKind, z.ZodType>;
export const definitionKindSchema = z.enum(DEFINITION_KINDS, { error: "kind must be product, pack, limits or profile" });

export const definitionCreatedSchema = z
  .object({
    id: z.string().meta({ description: "this version's id (what a review names)" }),
    version: z.number().int(),
    sha256: z.string().meta({ description: "SHA-256 of the canonical JSON body" }),
    kind: definitionKindSchema,
    lineage: z.string().meta({ description: "shared by every version of this definition" }),
    name: z.string(),
  })
  .meta({ id: "DefinitionCreated" });

export const pathIdSchema = z.object({ id: id("record") });

// --- reviews ----------------------------------------------------------------------------------------
export const reviewRequestSchema = z
  .strictObject({
    trace_id: id("trace"),
    product_id: id("product"),
    pack_id: id("pack").optional(),
    limits_id: id("limit set"),
    model: modelChoiceSchema.optional(),
    window: z
      .string()
      .regex(/^[^/]+\/[^/]+$/, { message: "must be START/END, two ISO 8601 date-times (e.g. 2026-06-16T05:00:00Z/2026-06-16T11:00:00Z)" })
      .optional()
      .meta({ description: "the judged window, START/END as in the CLI's --window" }),
    title: z.string().trim().min(1).max(160).optional(),
  })
  .meta({ id: "ReviewRequest" });
export type ReviewRequest = z.infer<typeof reviewRequestSchema>;

const signatureSchema = z.object({
  decision: z.enum(["accept", "hold", "reject"]),
  signed_by: z.string(),
  signed_at: isoTime,
  meaning: z.string().nullable(),
  comment: z.string().nullable(),
});

export const reviewSchema = z
  .looseObject({
    id: z.string(),
    status: z.enum(["open", "signed"]),
    result_sha256: z.string().meta({ description: "SHA-256 of the canonical result and the core series" }),
    title: z.string(),
    created_at: isoTime,
    trace: z.object({ id: z.string(), name: z.string(), sha256: z.string(), samples: z.number().int() }),
    product_id: z.string(),
    pack_id: z.string().nullable(),
    limits_id: z.string(),
    corrects_id: z.string().nullable(),
    signature: signatureSchema.nullable(),
    engine_version: z.string(),
    outcome: z.enum(["accept", "hold", "reject"]),
    rules: z.array(z.looseObject({ id: z.string(), status: z.enum(["pass", "fail", "inconclusive"]) })),
    cautions: z.array(z.string()),
  })
  .meta({ id: "Review", description: "the stored review: the same result JSON `corelag review` prints (screening, solver, gaps, rules, mkt_C, window, bands, outcome, cautions), with its id, status and result hash" });

export const runAcceptedSchema = z
  .object({
    run_id: z.string(),
    status: z.enum(["running", "done", "failed", "cancelled"]),
    progress: z.number().meta({ description: "fraction done, 0 to 1" }),
    href: z.string().meta({ description: "where to follow it: GET /api/v1/runs/{run_id}" }),
  })
  .meta({ id: "RunAccepted" });

export const runSchema = z
  .object({
    run_id: z.string(),
    status: z.enum(["running", "done", "failed", "cancelled"]),
    progress: z.number(),
    review_id: z.string().nullable(),
    message: z.string().nullable(),
    started_at: isoTime,
    finished_at: isoTime.nullable(),
  })
  .meta({ id: "Run" });

export const reviewListQuerySchema = z
  .strictObject({
    status: z.enum(["open", "signed"], { error: "status must be open or signed" }).optional(),
    outcome: z.enum(["accept", "hold", "reject"], { error: "outcome must be accept, hold or reject" }).optional(),
    after: z.string().min(1).max(64).optional().meta({ description: "the next_after of the previous page" }),
    limit: queryInt("limit", 1, 200).optional().meta({ description: "at most 200; default 50" }),
  })
  .meta({ id: "ReviewListQuery" });

export const reviewSummarySchema = z
  .object({
    id: z.string(),
    title: z.string(),
    status: z.enum(["open", "signed"]),
    outcome: z.enum(["accept", "hold", "reject"]),
    decision: z.enum(["accept", "hold", "reject"]).nullable(),
    created_at: isoTime,
    trace_id: z.string(),
    product_id: z.string(),
    limits_id: z.string(),
    result_sha256: z.string(),
  })
  .meta({ id: "ReviewSummary" });

export const reviewListSchema = z
  .object({
    items: z.array(reviewSummarySchema),
    next_after: z.string().nullable().meta({ description: "pass as `after` for the next (older) page; null on the last page" }),
  })
  .meta({ id: "ReviewList" });

export const signOffRequestSchema = z
  .strictObject({
    decision: z.enum(["accept", "hold", "reject"], { error: "decision must be accept, hold or reject" }),
    comment: z.string().trim().max(2000, { message: "at most 2,000 characters" }).optional(),
    password: z.string().min(1, { message: "re-enter the token owner's password: it is the second component of the signature" }).max(1024),
  })
  .meta({ id: "SignOffRequest" });

// --- audit ------------------------------------------------------------------------------------------
export const auditQuerySchema = z
  .strictObject({
    after: queryInt("after", 0, Number.MAX_SAFE_INTEGER).optional().meta({ description: "entries after this sequence number (default 0: from the first)" }),
    limit: queryInt("limit", 1, 1000).optional().meta({ description: "at most 1,000; default 100" }),
  })
  .meta({ id: "AuditQuery" });

export const auditEntrySchema = z
  .object({
    seq: z.number().int(),
    at: isoTime,
    action: z.string(),
    entity: z.string(),
    entity_id: z.string(),
    actor: z.string().meta({ description: "the user, the API token (with its owner), cli:<os user> or system:<what>" }),
    details: z.unknown(),
    prev_hash: z.string(),
    hash: z.string(),
  })
  .meta({ id: "AuditEntry" });

export const auditPageSchema = z
  .object({
    entries: z.array(auditEntrySchema),
    next_after: z.number().int().nullable().meta({ description: "pass as `after` for the next page; null when this page reached the chain's head" }),
  })
  .meta({ id: "AuditPage" });

// --- monitors (issue 17: the fields are the issue's, exactly) ------------------------------------------
export const monitorCreateRequestSchema = createMonitorSchema.meta({
  id: "MonitorCreateRequest",
  description: "the product, pack and limit set by id (any version); alert.lead_min: raise a forecast alert when a limit is forecast within this many minutes",
});

export const monitorCreatedSchema = z
  .object({
    id: z.string(),
    device_token: z.string().meta({ description: "an API token with the device scope, bound to this monitor: it only posts this monitor's readings. Shown once; revoke it like any token" }),
  })
  .meta({ id: "MonitorCreated" });

export const readingsQuerySchema = z
  .strictObject({
    partial: z
      .enum(["true", "false"], { error: "partial must be true or false" })
      .optional()
      .transform((v) => v === "true")
      .meta({ description: "true: keep the good readings of a batch with refused ones; default false: a batch with a refused reading stores nothing" }),
  })
  .meta({ id: "ReadingsQuery" });

export const readingsRequestSchema = z
  .object({ readings: z.array(readingSchema).max(MAX_READINGS_PER_BATCH) })
  .meta({ id: "Readings", description: `at most ${MAX_READINGS_PER_BATCH.toLocaleString("en")} readings; or text/csv with the header t,air_C[,probe_C]` });

export const readingsResultSchema = z
  .object({
    accepted: z.number().int(),
    duplicates: z.number().int().meta({ description: "readings equal to a stored one at the same time: ignored" }),
    conflicts: z.array(z.object({ index: z.number().int(), t: isoTime, reason: z.string() })).meta({ description: "readings at a stored time with other values: not stored" }),
    refused: z.array(z.object({ index: z.number().int(), reason: z.string() })).meta({ description: "with ?partial=true: the readings not stored, by index" }),
    batch: z.object({ id: z.string(), sha256: z.string().meta({ description: "SHA-256 of the request body, as recorded in the audit log" }) }).nullable(),
  })
  .meta({ id: "ReadingsResult" });

export const monitorStateSchema = z
  .strictObject({
    id: z.string(),
    last_reading: z.strictObject({ t: isoTime, air_C: z.number() }).nullable(),
    core_C: z.number().nullable().meta({ description: "the predicted core temperature after the last reading, °C" }),
    surface_C: z.number().optional().meta({ description: "the predicted surface temperature, when the model resolves one (not the exact lumped update)" }),
    rules: z.array(
      z.strictObject({
        id: z.string(),
        status_so_far: z.enum(["pass", "fail", "inconclusive"]),
        cumulative_min: z.number().meta({ description: "time beyond the rule's threshold so far, min" }),
        remaining_min: z.number().optional().meta({ description: "time left before the rule's allowance is used up, min" }),
      }),
    ),
    forecast: z
      .strictObject({
        assumed_air_C: z.number().meta({ description: "the air held for the forecast, °C" }),
        minutes_to_limit: z.number().nullable().meta({ description: "null: no limit is reached within the horizon" }),
        limit_rule: z.string().nullable(),
        horizon_min: z.number(),
        reason: z.string(),
      })
      .nullable(),
    stale: z.boolean().meta({ description: "no readings for three usual arrival intervals" }),
  })
  .meta({ id: "MonitorState" });

export const monitorClosedSchema = z.object({ trace_id: z.string(), review_id: z.string() }).meta({ id: "MonitorClosed" });

// --- tokens (CLI and admin; not an HTTP endpoint) ----------------------------------------------------
export const tokenScopeSchema = z.enum(TOKEN_SCOPES, { error: "scope must be read, write or device" });
