"use server";

import { redirect } from "next/navigation";
import { revalidatePath } from "next/cache";
import { closeMonitor, createMonitorService, ensureSweeper } from "@/lib/services/monitors";
import { guardAction } from "@/app/guard";
import { formValues, numberField, textField, type FormState } from "@/lib/validation";

export interface MonitorFormState extends FormState {
  /** the new monitor and its device token, shown once */
  created?: { id: string; device_token: string; name: string };
}

/** One entry per line (or comma): the webhook URLs and e-mail addresses of the form. */
const list = (v: string | undefined) => (v ?? "").split(/[\n,]/).map((s) => s.trim()).filter(Boolean);

/** Form field names for the API's field paths, so each message lands beside its input. */
const FIELD: Record<string, string> = { name: "name", product_id: "productId", pack_id: "packId", limits_id: "limitsId", shipment_id: "shipmentId", serial: "serial", model: "model", "alert.lead_min": "leadMin", "alert.webhooks": "webhooks", "alert.emails": "emails", "forecast_air.last": "holdLast", forecast_air: "hold" };

export const createMonitorAction = guardAction("monitor:edit", async (actor, _prev: MonitorFormState, form: FormData): Promise<MonitorFormState> => {
  const values = formValues(form);
  const hold = textField(form, "hold") === "mean" ? "mean" : "current";
  const input = {
    name: textField(form, "name") ?? "",
    product_id: textField(form, "productId") ?? "",
    ...(textField(form, "packId") ? { pack_id: textField(form, "packId") } : {}),
    limits_id: textField(form, "limitsId") ?? "",
    ...(textField(form, "shipmentId")?.trim() ? { shipment_id: textField(form, "shipmentId") } : {}),
    ...(textField(form, "serial")?.trim() ? { serial: textField(form, "serial") } : {}),
    model: textField(form, "model") || "auto",
    alert: { lead_min: numberField(form, "leadMin") ?? NaN, webhooks: list(textField(form, "webhooks")), emails: list(textField(form, "emails")) },
    forecast_air: hold === "mean" ? { hold, last: numberField(form, "holdLast") ?? 6 } : { hold },
  };
  const out = await createMonitorService(input, actor);
  if (!out.ok) {
    const key = FIELD[out.field] ?? FIELD[out.field.replace(/\.\d+$/, "")] ?? "form";
    return key === "form" ? { message: out.message, values } : { fieldErrors: { [key]: out.message.replace(/^[\w.]+: /, "") }, values };
  }
  ensureSweeper();
  revalidatePath("/monitors");
  return { created: { id: out.id, device_token: out.device_token, name: input.name } };
});

export const closeMonitorAction = guardAction("monitor:edit", async (actor, _prev: FormState, form: FormData): Promise<FormState> => {
  const id = textField(form, "monitorId") ?? "";
  const out = await closeMonitor(id, actor);
  if (!out.ok) return { message: out.message };
  redirect(`/reviews/${out.reviewId}`);
});
