"use server";

import { redirect } from "next/navigation";
import { revalidatePath } from "next/cache";
import { createShipmentFromForm, editLogger, registerLogger, signOffShipment, startShipmentReview } from "@/lib/services/shipments";
import { signatureSchema } from "@/lib/services/signature";
import { saveLaneProfile, buildLaneProfile, type HistoryRequest } from "@/lib/services/lanes";
import { fieldErrors, formValues, textField, type FormState } from "@/lib/validation";
import { waitForRun } from "@/lib/services/runs";
import { can, guardAction } from "@/app/guard";
import { refusalMessage } from "@/lib/services/access";

/** datetime-local inputs carry no zone; the forms state that they are UTC. */
const utc = (v: string | undefined) => (v ? (v.length === 16 ? `${v}:00Z` : v.length === 19 ? `${v}Z` : v) : undefined);

export const createShipmentAction = guardAction("shipment:edit", async (actor, _prev: FormState, form: FormData): Promise<FormState> => {
  const values = formValues(form);
  let loggers: unknown;
  try {
    loggers = JSON.parse(textField(form, "loggers") || "[]");
  } catch {
    return { fieldErrors: { loggers: "the logger list could not be read; reload the page" }, values };
  }
  if (!Array.isArray(loggers)) return { fieldErrors: { loggers: "the logger list could not be read; reload the page" }, values };
  const r = await createShipmentFromForm(
    {
      reference: textField(form, "reference") ?? "",
      laneId: textField(form, "laneId") || undefined,
      newLaneName: textField(form, "newLaneName") || undefined,
      newLaneOrigin: textField(form, "newLaneOrigin") || undefined,
      newLaneDestination: textField(form, "newLaneDestination") || undefined,
      carrier: textField(form, "carrier") || undefined,
      vehicle: textField(form, "vehicle") || undefined,
      plannedDepartureAt: utc(textField(form, "plannedDepartureAt") || undefined),
      plannedArrivalAt: utc(textField(form, "plannedArrivalAt") || undefined),
      actualDepartureAt: utc(textField(form, "actualDepartureAt") || undefined),
      actualArrivalAt: utc(textField(form, "actualArrivalAt") || undefined),
      notes: textField(form, "notes") || undefined,
      limitsId: textField(form, "limitsId") ?? "",
    },
    loggers,
    actor,
  );
  if (!r.ok) return r.field === "form" ? { message: r.message, values } : { fieldErrors: { [r.field.startsWith("loggers") ? "loggers" : r.field]: r.message }, values };
  redirect(`/shipments/${r.shipmentId}`);
});

export const runShipmentAction = guardAction("review:run", async (actor, _prev: FormState, form: FormData): Promise<FormState> => {
  const id = textField(form, "shipmentId") ?? "";
  const started = await startShipmentReview(id, actor);
  if (!started.ok) return { message: started.message };
  const run = await waitForRun(started.run.id, 3_000);
  if (run?.status === "failed") return { message: run.message };
  if (run?.status === "done") {
    revalidatePath(`/shipments/${id}`);
    redirect(`/shipments/${id}`);
  }
  redirect(`/runs/${started.run.id}`);
});

export const signShipmentAction = guardAction("review:sign", async (actor, _prev: FormState, form: FormData): Promise<FormState> => {
  // never echo the password back into the form
  const { password: _p, ...values } = formValues(form);
  const id = textField(form, "shipmentId") ?? "";
  const parsed = signatureSchema.safeParse({ decision: textField(form, "decision") ?? "", comment: textField(form, "comment") || undefined, password: textField(form, "password") ?? "" });
  if (!parsed.success) return { fieldErrors: fieldErrors(parsed.error), values };
  const res = await signOffShipment(id, parsed.data, actor);
  if (!res.ok && res.reason === "comment-required") return { fieldErrors: { comment: res.message }, values };
  if (!res.ok && res.reason === "password") return { fieldErrors: { password: res.message }, values };
  if (!res.ok) return { message: res.message, values };
  revalidatePath(`/shipments/${id}`);
  redirect(`/shipments/${id}`);
});

export const saveLoggerAction = guardAction("shipment:edit", async (actor, _prev: FormState, form: FormData): Promise<FormState> => {
  const values = formValues(form);
  const id = textField(form, "loggerId");
  const input = {
    serial: textField(form, "serial") ?? "",
    description: textField(form, "description") ?? "",
    accuracyK: textField(form, "accuracyK") ?? "",
    lastCalibrationAt: utc(textField(form, "lastCalibrationAt") || undefined),
    nextCalibrationAt: utc(textField(form, "nextCalibrationAt") || undefined),
  };
  const r = id ? await editLogger(id, input, actor) : await registerLogger(input, actor);
  if (!r.ok) return r.field === "form" ? { message: r.message, values } : { fieldErrors: { [r.field]: r.message }, values };
  revalidatePath("/loggers");
  redirect("/loggers");
});

function historyRequest(form: FormData): HistoryRequest {
  return {
    shipmentIds: form.getAll("shipmentIds").map(String),
    position: textField(form, "position") || undefined,
    align: (textField(form, "align") || "departure") as "departure" | "time-of-day",
    percentile: (textField(form, "percentile") ?? "") as unknown as number,
    step_min: (textField(form, "step_min") ?? "") as unknown as number,
    smooth_steps: (textField(form, "smooth_steps") || "1") as unknown as number,
    timeZone: textField(form, "timeZone") || undefined,
    name: textField(form, "name") || undefined,
  };
}

export interface ProfilePreviewState extends FormState {
  preview?: {
    offset_min: number[];
    profile_C: number[];
    percentile_C: number[];
    min_C: number[];
    max_C: number[];
    traces_C: number[][];
    sources: Array<{ file: string; shipment: string; position: string }>;
    caution: string;
  };
  savedId?: string;
}

/** "Show" builds the envelope and profile without storing; "Save" stores the profile as a new definition. */
export const laneProfileAction = guardAction("read", async (actor, _prev: ProfilePreviewState, form: FormData): Promise<ProfilePreviewState> => {
  const values = formValues(form);
  const laneId = textField(form, "laneId") ?? "";
  const req = historyRequest(form);
  if (textField(form, "intent") === "save") {
    // showing a profile is a read; saving it is a definition edit
    if (!can(actor, "definition:edit")) return { message: refusalMessage("definition:edit", actor), values };
    const saved = await saveLaneProfile(laneId, req, actor);
    if (!saved.ok) return saved.field === "form" ? { message: saved.message, values } : { fieldErrors: { [saved.field]: saved.message }, values };
    redirect(`/design/profiles?saved=${saved.definitionId}`);
  }
  const built = await buildLaneProfile(laneId, req);
  if (!built.ok) return built.field === "form" ? { message: built.message, values } : { fieldErrors: { [built.field]: built.message }, values };
  const e = built.build.envelope;
  return {
    values,
    preview: {
      offset_min: Array.from(e.offset_s, (s) => s / 60),
      profile_C: Array.from(e.profile_C),
      percentile_C: Array.from(e.percentile_C),
      min_C: Array.from(e.min_C),
      max_C: Array.from(e.max_C),
      traces_C: e.traces_C.map((t) => Array.from(t)),
      sources: built.build.sources.map((s) => ({ file: s.file, shipment: s.shipment, position: s.position })),
      caution: built.build.caution,
    },
  };
});
