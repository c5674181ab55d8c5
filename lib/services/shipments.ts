// Shipments (issue 15): forms' schemas, creating a shipment with its logger entries, the logger register,
// the shipment review (every logger × product review in the engine pool, with progress; each stored as a
// review, then the shipment's outcome) and the one sign-off for the load.
import { z } from "zod";
import type { Outcome } from "../exposure/rules";
import { tryRunReview, type ReviewComputation, type ReviewResult } from "../review";
import { combineShipment, worstExcursions, loggerReviewOption, calibrationOverdue, type LoggerReviews } from "../shipment";
import { serialFromMetadata } from "../shipment/matching";
import { getDefinition } from "../db/definitions";
import { getTrace } from "../db/traces";
import {
  addShipmentLoggers, createLane, createLogger, createShipment, getShipment, laneByName, loggersBySerial, newRunId, recordShipmentRun, shipmentRunStored, signShipment, updateLogger,
  type ShipmentLoggerInput, type ShipmentSignOutcome,
} from "../db/shipments";
import { newReviewOf, prepareReview, type PreparedReview } from "./reviews";
import { commentProblem, SIGNATURE_MEANING, signableProblem, signatureSchema, signerProblem, type SignatureOutcome } from "./signature";
import { runReviewInPool } from "./enginePool";
import { startShipmentRun, type RunContext, type RunState } from "./runs";
import type { Actor } from "../access/actor";

const text = (what: string, max: number) => z.string().trim().max(max, { message: `${what}: at most ${max} characters` });
const optionalText = (what: string, max: number) => text(what, max).optional().transform((v) => (v ? v : null));
const optionalTime = z
  .string()
  .trim()
  .optional()
  .refine((v) => !v || !Number.isNaN(Date.parse(v)), { message: "must be a date and time (ISO 8601, e.g. 2026-06-16T05:00Z)" })
  .transform((v) => (v ? new Date(v) : null));

export const laneSchema = z.object({
  name: text("lane", 120).min(1, { message: "give the lane a name" }),
  origin: text("origin", 120).min(1, { message: "give the origin" }),
  destination: text("destination", 120).min(1, { message: "give the destination" }),
});

export const shipmentFormSchema = z
  .object({
    reference: text("reference", 120).min(1, { message: "give the shipment a reference" }),
    laneId: z.string().trim().optional(),
    /** a new lane, when no existing one is chosen */
    newLaneName: z.string().trim().max(120).optional(),
    newLaneOrigin: z.string().trim().max(120).optional(),
    newLaneDestination: z.string().trim().max(120).optional(),
    carrier: optionalText("carrier", 120),
    vehicle: optionalText("vehicle", 120),
    plannedDepartureAt: optionalTime,
    plannedArrivalAt: optionalTime,
    actualDepartureAt: optionalTime,
    actualArrivalAt: optionalTime,
    notes: optionalText("notes", 2000),
    limitsId: z.string().min(1, { message: "choose the limit set for this shipment" }),
  })
  .refine((s) => !s.plannedDepartureAt || !s.plannedArrivalAt || s.plannedArrivalAt > s.plannedDepartureAt, { message: "the planned arrival must come after the planned departure", path: ["plannedArrivalAt"] })
  .refine((s) => !s.actualDepartureAt || !s.actualArrivalAt || s.actualArrivalAt > s.actualDepartureAt, { message: "the actual arrival must come after the actual departure", path: ["actualArrivalAt"] })
  .refine((s) => s.laneId || !s.newLaneName || (s.newLaneOrigin && s.newLaneDestination), { message: "a new lane needs an origin and a destination", path: ["newLaneOrigin"] });
export type ShipmentForm = z.input<typeof shipmentFormSchema>;

export const shipmentLoggerSchema = z.object({
  position: text("position", 120).min(1, { message: "give the logger's position in the load (front, middle, rear, top, bottom, tote N)" }),
  serial: optionalText("serial", 120),
  fileNamePattern: optionalText("file-name pattern", 200),
  products: z
    .array(z.object({ productId: z.string().min(1, { message: "choose a product" }), packId: z.string().optional().transform((v) => v || undefined), governing: z.boolean().optional() }))
    .min(1, { message: "choose at least one product this logger stands for" })
    .max(50),
});

export type FieldRefusal = { ok: false; field: string; message: string };
const refusal = (e: z.ZodError): FieldRefusal => ({ ok: false, field: String(e.issues[0]!.path[0] ?? "form"), message: e.issues[0]!.message });

/** Creates a shipment (and a new lane when asked) with its logger entries. */
export async function createShipmentFromForm(input: ShipmentForm, loggers: z.input<typeof shipmentLoggerSchema>[], actor: Actor): Promise<{ ok: true; shipmentId: string } | FieldRefusal> {
  const parsed = shipmentFormSchema.safeParse(input);
  if (!parsed.success) return refusal(parsed.error);
  const s = parsed.data;
  const limits = await getDefinition(s.limitsId);
  if (!limits || limits.kind !== "limits") return { ok: false, field: "limitsId", message: "that limit set does not exist" };
  const entries: ShipmentLoggerInput[] = [];
  for (const [i, l] of loggers.entries()) {
    const p = shipmentLoggerSchema.safeParse(l);
    if (!p.success) return { ok: false, field: `loggers.${i}.${String(p.error.issues[0]!.path.join("."))}`, message: `logger ${i + 1}: ${p.error.issues[0]!.message}` };
    const check = await checkProducts(p.data.products);
    if (check) return { ok: false, field: `loggers.${i}.products`, message: `logger ${i + 1}: ${check}` };
    entries.push(p.data);
  }
  const governingCheck = governingConflict(entries);
  if (governingCheck) return { ok: false, field: "loggers", message: governingCheck };
  let laneId = s.laneId || null;
  if (!laneId && s.newLaneName) {
    const existing = await laneByName(s.newLaneName);
    laneId = existing ? existing.id : (await createLane({ name: s.newLaneName, origin: s.newLaneOrigin!, destination: s.newLaneDestination! }, actor)).id;
  }
  const { newLaneName: _n, newLaneOrigin: _o, newLaneDestination: _d, laneId: _l, ...rest } = s;
  return { ok: true, shipmentId: await createShipment({ ...rest, laneId }, entries, actor) };
}

async function checkProducts(products: ShipmentLoggerInput["products"]): Promise<string | null> {
  for (const p of products) {
    const d = await getDefinition<{ h_W_m2K?: number }>(p.productId);
    if (!d || d.kind !== "product") return "that product does not exist";
    if (p.packId) {
      const k = await getDefinition(p.packId);
      if (!k || k.kind !== "pack") return "that pack does not exist";
    } else if (d.body.h_W_m2K === undefined) return `${d.name} has no surface coefficient of its own: choose the pack used`;
  }
  return null;
}

function governingConflict(entries: readonly ShipmentLoggerInput[]): string | null {
  const seen = new Set<string>();
  for (const e of entries) for (const p of e.products) {
    if (!p.governing) continue;
    if (seen.has(p.productId)) return "a product can have one governing logger (or none: the worst of its loggers governs)";
    seen.add(p.productId);
  }
  return null;
}

export async function addLoggersToShipment(shipmentId: string, loggers: z.input<typeof shipmentLoggerSchema>[], actor: Actor): Promise<{ ok: true } | FieldRefusal> {
  const shipment = await getShipment(shipmentId);
  if (!shipment) return { ok: false, field: "form", message: "that shipment does not exist" };
  if (shipment.status === "signed") return { ok: false, field: "form", message: "this shipment is signed off; its loggers cannot change" };
  const entries: ShipmentLoggerInput[] = [];
  for (const l of loggers) {
    const p = shipmentLoggerSchema.safeParse(l);
    if (!p.success) return refusal(p.error);
    const check = await checkProducts(p.data.products);
    if (check) return { ok: false, field: "products", message: check };
    entries.push(p.data);
  }
  const conflict = governingConflict([...shipment.loggers, ...entries]);
  if (conflict) return { ok: false, field: "products", message: conflict };
  await addShipmentLoggers(shipmentId, entries, actor);
  return { ok: true };
}

// ---- logger register ---------------------------------------------------------------------------------

export const loggerRegisterSchema = z
  .object({
    serial: text("serial", 120).min(1, { message: "give the logger's serial" }),
    description: text("description", 200).default(""),
    accuracyK: z.coerce.number({ error: "accuracy must be a number of K" }).finite().min(0.01, { message: "accuracy must be between 0.01 and 10 K" }).max(10, { message: "accuracy must be between 0.01 and 10 K" }),
    lastCalibrationAt: optionalTime,
    nextCalibrationAt: optionalTime,
  })
  .refine((l) => !l.lastCalibrationAt || !l.nextCalibrationAt || l.nextCalibrationAt > l.lastCalibrationAt, { message: "the next calibration must come after the last", path: ["nextCalibrationAt"] });

export async function registerLogger(input: z.input<typeof loggerRegisterSchema>, actor: Actor): Promise<{ ok: true; id: string } | FieldRefusal> {
  const p = loggerRegisterSchema.safeParse(input);
  if (!p.success) return refusal(p.error);
  if ((await loggersBySerial([p.data.serial])).length > 0) return { ok: false, field: "serial", message: `logger ${p.data.serial} is already registered: edit it instead` };
  return { ok: true, id: (await createLogger(p.data, actor)).id };
}

export async function editLogger(id: string, input: z.input<typeof loggerRegisterSchema>, actor: Actor): Promise<{ ok: true } | FieldRefusal> {
  const p = loggerRegisterSchema.safeParse(input);
  if (!p.success) return refusal(p.error);
  const { serial: _s, ...rest } = p.data;
  await updateLogger(id, rest, actor);
  return { ok: true };
}

// ---- shipment review ---------------------------------------------------------------------------------

/** The date a logger's calibration is judged against: the actual departure, else the planned one, else the trace's start. */
function shipmentDate_s(s: { actualDepartureAt: Date | null; plannedDepartureAt: Date | null }, traceStart: Date): number {
  return (s.actualDepartureAt ?? s.plannedDepartureAt ?? traceStart).getTime() / 1000;
}

interface PlannedReview {
  shipmentLoggerId: string;
  position: string;
  productId: string;
  governing: boolean;
  prepared: PreparedReview;
  overdue: boolean;
}

/** Loads every logger × product review of a shipment, each re-validated; refuses by logger what cannot run. */
export async function planShipmentReview(shipmentId: string): Promise<{ ok: true; reviews: PlannedReview[]; reference: string } | { ok: false; message: string }> {
  const s = await getShipment(shipmentId);
  if (!s) return { ok: false, message: "that shipment does not exist" };
  if (s.status === "signed") return { ok: false, message: "this shipment is signed off; a new review of the load is a new shipment" };
  if (s.loggers.length === 0) return { ok: false, message: "add the loggers of the load first" };
  const missing = s.loggers.filter((l) => !l.traceId);
  if (missing.length > 0) return { ok: false, message: `no trace yet for ${missing.map((l) => `logger ${l.ordinal} (${l.position})`).join(", ")}: upload their files first` };
  const reviews: PlannedReview[] = [];
  for (const l of s.loggers) {
    const trace = await getTrace(l.traceId!);
    if (!trace) return { ok: false, message: `the trace of logger ${l.ordinal} is missing` };
    const serial = l.serial ?? serialFromMetadata(trace.meta.importSettings.metadata ?? []);
    const [register] = serial ? await loggersBySerial([serial]) : [];
    const date_s = shipmentDate_s(s, trace.meta.startAt);
    const entry = register ? { serial: register.serial, accuracy_K: register.accuracyK, nextCalibration_s: register.nextCalibrationAt ? register.nextCalibrationAt.getTime() / 1000 : null } : null;
    for (const p of l.products) {
      const product = await getDefinition<{ name: string }>(p.productId);
      const ready = await prepareReview({ title: `${s.reference} · ${l.position} · ${product?.body.name ?? "product"}`, traceId: l.traceId!, productId: p.productId, packId: p.packId, limitsId: s.limitsId, model: "auto" });
      if (!ready.ok) return { ok: false, message: `logger ${l.ordinal} (${l.position}), ${product?.body.name ?? p.productId}: ${ready.message}` };
      if (entry) ready.prepared.input.options = { ...ready.prepared.input.options!, logger: loggerReviewOption(entry, date_s) };
      reviews.push({ shipmentLoggerId: l.id, position: l.position, productId: p.productId, governing: p.governing === true, prepared: ready.prepared, overdue: calibrationOverdue(entry, date_s) });
    }
  }
  return { ok: true, reviews, reference: s.reference };
}

/** The combination stored with the shipment: products, loggers, worst excursions, cautions. */
export interface ShipmentResult {
  outcome: Outcome;
  products: Array<{ productId: string; outcome: Outcome; governing_logger: string; governing_by: "named" | "worst" }>;
  loggers: Array<{ shipmentLoggerId: string; outcome: Outcome }>;
  worst_excursions: ReturnType<typeof worstExcursions>;
  cautions: string[];
}

export function combineStored(planned: ReadonlyArray<{ shipmentLoggerId: string; position: string; productId: string; governing: boolean; result: ReviewResult }>): ShipmentResult {
  const byLogger = new Map<string, LoggerReviews>();
  for (const p of planned) {
    const l = byLogger.get(p.shipmentLoggerId) ?? { key: p.shipmentLoggerId, position: p.position, reviews: [] };
    l.reviews.push({ product: p.productId, governing: p.governing, result: p.result });
    byLogger.set(p.shipmentLoggerId, l);
  }
  const loggers = [...byLogger.values()];
  const c = combineShipment(loggers);
  const cautions = [...new Set(planned.flatMap((p) => p.result.cautions))];
  return {
    outcome: c.outcome,
    products: c.products.map((p) => ({ productId: p.product, outcome: p.outcome, governing_logger: p.governing_logger, governing_by: p.governing_by })),
    loggers: c.loggers.map((l) => ({ shipmentLoggerId: l.key, outcome: l.outcome })),
    worst_excursions: worstExcursions(loggers, 10),
    cautions: [
      ...cautions,
      "The shipment is rejected if any product's governing review rejects, held if any holds, and accepted only if all accept; a product without a named governing logger is governed by the worst of the loggers covering it.",
      ...c.notes,
    ],
  };
}

/**
 * Starts the shipment review in the background (lib/services/runs.ts: in this process on SQLite, a job in the
 * database's queue on PostgreSQL); the plan is checked here first so a shipment that cannot be reviewed is
 * refused at once. The work itself is `computeShipmentRun`.
 */
export async function startShipmentReview(shipmentId: string, actor: Actor): Promise<{ ok: true; run: RunState } | { ok: false; message: string }> {
  const plan = await planShipmentReview(shipmentId);
  if (!plan.ok) return plan;
  return { ok: true, run: await startShipmentRun(shipmentId, `Shipment ${plan.reference}: ${plan.reviews.length} reviews`, plan.reviews.length, actor) };
}

/**
 * One shipment review run, stored under `runId`: every logger × product review in the engine pool (as many at
 * once as the pool has threads), then, when all have finished, every review, its link and the shipment's outcome
 * in one transaction. A failure or cancel stores nothing. A run already stored under `runId` (a queued run
 * retried after its store committed) is not stored again.
 */
export async function computeShipmentRun(shipmentId: string, runId: string, actor: Actor, { signal, setProgress }: RunContext): Promise<{ ok: true } | { ok: false; message: string }> {
  if (await shipmentRunStored(runId)) return { ok: true };
  const plan = await planShipmentReview(shipmentId);
  if (!plan.ok) return plan;
  const { reviews } = plan;
  let done = 0;
  setProgress(0, reviews.length);
  const computed = await Promise.all(
    reviews.map(async (r) => {
      const attempt = await runReviewInPool(r.prepared.input, { signal });
      setProgress(++done, reviews.length);
      return { r, attempt };
    }),
  );
  const failed = computed.find((c) => !c.attempt.ok);
  if (failed && !failed.attempt.ok) return { ok: false, message: `${failed.r.prepared.title}: ${failed.attempt.message}` };
  if (signal.aborted) throw signal.reason;
  // pg-boss hands a job to one worker at a time: only an attempt that outlived the job's expiry could race here
  await storeShipmentRun(shipmentId, runId, computed.map((c) => ({ r: c.r, computation: (c.attempt as { ok: true; computation: ReviewComputation }).computation })), actor);
  return { ok: true };
}

/**
 * The same shipment review computed in this thread, without the engine pool or a run to follow: for the demo
 * loader (which runs before the server, where a small load takes a second). Stores exactly what a run stores.
 */
export async function reviewShipmentHere(shipmentId: string, actor: Actor): Promise<{ ok: true } | { ok: false; message: string }> {
  const plan = await planShipmentReview(shipmentId);
  if (!plan.ok) return plan;
  const computed: Array<{ r: PlannedReview; computation: ReviewComputation }> = [];
  for (const r of plan.reviews) {
    const attempt = tryRunReview(r.prepared.input);
    if (!attempt.ok) return { ok: false, message: `${r.prepared.title}: ${attempt.message}` };
    computed.push({ r, computation: attempt.computation });
  }
  await storeShipmentRun(shipmentId, newRunId(), computed, actor);
  return { ok: true };
}

/** Every review, its link and the shipment's combined outcome, in one transaction (recordShipmentRun). */
async function storeShipmentRun(shipmentId: string, runId: string, computed: ReadonlyArray<{ r: PlannedReview; computation: ReviewComputation }>, actor: Actor): Promise<void> {
  const items = computed.map(({ r, computation }) => ({ shipmentLoggerId: r.shipmentLoggerId, productId: r.productId, review: newReviewOf(r.prepared, computation, actor) }));
  const combined = combineStored(computed.map(({ r, computation }) => ({ shipmentLoggerId: r.shipmentLoggerId, position: r.position, productId: r.productId, governing: r.governing, result: computation.result })));
  await recordShipmentRun(shipmentId, runId, items, combined.outcome, combined, actor);
}

/**
 * One electronic signature for the shipment and every review of its latest run (issue 13's rules apply to
 * each: a signed-in person re-entering their password, the second-person rule of each review's limit set,
 * and every review still reproducing from its stored inputs; any refusal signs nothing).
 */
export async function signOffShipment(shipmentId: string, input: z.input<typeof signatureSchema>, actor: Actor): Promise<SignatureOutcome | ShipmentSignOutcome> {
  const s = signatureSchema.parse(input);
  const shipment = await getShipment(shipmentId);
  if (!shipment) return { ok: false, reason: "not-found", message: "that shipment does not exist" };
  if (shipment.status === "signed") return { ok: false, reason: "signed", message: "this shipment is already signed off" };
  // settled before the password, so a form that could never be signed uses up no attempts toward the lockout
  if (shipment.outcome) {
    const early = commentProblem(s.decision, s.comment, shipment.outcome);
    if (early) return early;
  }
  const signer = await signerProblem(actor, s.password, `shipment ${shipmentId}`);
  if (signer) return signer;
  const user = actor as Actor & { kind: "user" };
  for (const l of shipment.reviews) {
    if (l.review.status === "signed") continue; // signed on its own before: that signature stands
    const refusal = await signableProblem(l.reviewId, user);
    if (refusal) return refusal;
  }
  const meaning = `${SIGNATURE_MEANING[s.decision]}, for shipment ${shipment.reference} as a whole`;
  return signShipment(shipmentId, { reviewer: user.name, decision: s.decision, comment: s.comment || undefined, meaning }, actor);
}
