import { z } from "zod";
import { AUDIT_ACTIONS, AUDIT_ENTITIES, type AuditFilter } from "@/lib/db/auditQueries";
import { dayEnd, dayParam, dayStart, listParamsSchema, nonEmpty } from "@/app/components/listParams";

/** The audit page's and the CSV export's filters, from the address bar (malformed values are ignored). */
export const auditParamsSchema = listParamsSchema.extend({
  entity: z.enum(AUDIT_ENTITIES).optional().catch(undefined),
  action: z.enum(AUDIT_ACTIONS).optional().catch(undefined),
  object: z.string().trim().max(100).optional().catch(undefined),
  from: dayParam,
  to: dayParam,
});
export type AuditParams = z.infer<typeof auditParamsSchema>;

export function parseAuditParams(raw: Record<string, string | string[] | undefined>): AuditParams {
  return auditParamsSchema.parse(nonEmpty(raw));
}

/** The storage filter: days are whole days in the display zone, "to" inclusive. */
export function auditFilter(p: AuditParams, zone: string): AuditFilter {
  return { entity: p.entity, action: p.action, object: p.object || undefined, from: dayStart(p.from, zone), to: dayEnd(p.to, zone), q: p.q };
}

/** The filters as address parameters (for links that keep them). */
export function auditQueryParams(p: AuditParams): Record<string, string | undefined> {
  return { entity: p.entity, action: p.action, object: p.object, from: p.from, to: p.to, q: p.q };
}
