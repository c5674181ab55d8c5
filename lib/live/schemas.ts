// The request that creates a monitor (POST /api/v1/monitors and the create form): the fields, with
// the model and the forecast's air as optional choices. Pure, so the API's schemas (lib/api) and the
// service (lib/services/monitors.ts) validate with the same object.
import { z } from "zod";
import { modelChoiceSchema } from "../thermal/definitions";

const text = (what: string, max: number) => z.string({ error: `${what} must be text` }).trim().min(1, { message: `${what} is empty` }).max(max, { message: `${what} is longer than ${max} characters` });

export const createMonitorSchema = z.strictObject({
  name: text("name", 160),
  product_id: text("product_id", 60),
  pack_id: text("pack_id", 60).optional(),
  limits_id: text("limits_id", 60),
  shipment_id: text("shipment_id", 120).optional(),
  serial: text("serial", 120).optional(),
  model: modelChoiceSchema.default("auto"),
  alert: z.strictObject({
    /** a forecast alert is raised when the limit is forecast within this many minutes (0 to 7 days) */
    lead_min: z.number({ error: "alert.lead_min must be a number of minutes" }).finite().min(0, { message: "alert.lead_min must be 0 min or more" }).max(10_080, { message: "alert.lead_min must be at most 10 080 min (7 days)" }),
    webhooks: z.array(z.url({ protocol: /^https?$/, message: "each webhook must be an http(s) URL" })).max(10, { message: "at most 10 webhooks" }).default([]),
    emails: z.array(z.email({ message: "each e-mail must be an address like name@example.org" })).max(20, { message: "at most 20 e-mail addresses" }).default([]),
  }, { error: "alert is required: {\"lead_min\": minutes}" }),
  /** the air the forecast holds: the last reading's ("current"), or the mean of the last `last` readings */
  forecast_air: z.strictObject({ hold: z.enum(["current", "mean"]), last: z.number().int().min(2).max(1000).optional() }).optional(),
});
export type CreateMonitorInput = z.input<typeof createMonitorSchema>;
