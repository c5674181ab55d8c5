import { z } from "zod";
import { AUDIT_ACTIONS, AUDIT_ENTITIES, type AuditAction, type AuditEntity, type AuditFilter } from "@/lib/db/auditQueries";
import { dayEnd, dayParam, dayStart, listParamsSchema, nonEmpty } from "@/app/components/listParams";

/**
 * The audit page's and the CSV export's filters, from the address bar. Malformed days and pages are ignored;
 * a kind or action the log does not know is kept as given and reported (see `unknown`).
 */
const rawParamsSchema = listParamsSchema.extend({
  entity: z.string().max(100).optional().catch(undefined),
  /** the label's word ("Kind of record"), accepted for entity in a typed address */
  kind: z.string().max(100).optional().catch(undefined),
  action: z.string().max(100).optional().catch(undefined),
  object: z.string().trim().max(100).optional().catch(undefined),
  from: dayParam,
  to: dayParam,
});

/** A kind or action filter whose value the log does not know. */
export interface UnknownFilter {
  field: "entity" | "action";
  value: string;
}

export interface AuditParams extends Omit<z.infer<typeof rawParamsSchema>, "entity" | "kind" | "action"> {
  entity?: AuditEntity;
  action?: AuditAction;
  /**
   * Filters naming a value the log does not know. Dropping them would show every entry as if it matched
   * (a mistyped ?action= read as "all"): the page shows the message and no entries instead, the export refuses.
   */
  unknown: UnknownFilter[];
}

const known = <T extends string>(list: readonly T[], v: string | undefined): v is T => v !== undefined && (list as readonly string[]).includes(v);

export function parseAuditParams(raw: Record<string, string | string[] | undefined>): AuditParams {
  const { entity: e, kind, action, ...rest } = rawParamsSchema.parse(nonEmpty(raw));
  const entity = e ?? kind;
  const unknown: UnknownFilter[] = [];
  if (entity !== undefined && !known(AUDIT_ENTITIES, entity)) unknown.push({ field: "entity", value: entity });
  if (action !== undefined && !known(AUDIT_ACTIONS, action)) unknown.push({ field: "action", value: action });
  return { ...rest, entity: known(AUDIT_ENTITIES, entity) ? entity : undefined, action: known(AUDIT_ACTIONS, action) ? action : undefined, unknown };
}

/** The message for filters the log does not know, naming each value as given. */
export function unknownFilterMessage(unknown: readonly UnknownFilter[]): string {
  const what = unknown.map((u) => (u.field === "entity" ? `kind of record “${u.value}”` : `action “${u.value}”`));
  return `No entries shown: the log has no ${what.join(" and no ")}. Choose from the lists (“any” shows every entry).`;
}

/** The storage filter: days are whole days in the display zone, "to" inclusive. */
export function auditFilter(p: AuditParams, zone: string): AuditFilter {
  return { entity: p.entity, action: p.action, object: p.object || undefined, from: dayStart(p.from, zone), to: dayEnd(p.to, zone), q: p.q };
}

/** The filters as address parameters (for links that keep them). */
export function auditQueryParams(p: AuditParams): Record<string, string | undefined> {
  return { entity: p.entity, action: p.action, object: p.object, from: p.from, to: p.to, q: p.q };
}
