import { DateTime } from "luxon";
import { z } from "zod";
import { displayZoneOrUtc } from "@/lib/display/time";

/**
 * The page number and search text of a list, from the address bar. Malformed values are ignored
 * (page 1, no search) rather than refused: the address bar is not a form.
 */
export const listParamsSchema = z.object({
  page: z.coerce.number().int().min(1).max(1_000_000).optional().catch(undefined),
  q: z.string().max(100).optional().catch(undefined),
});

/** Drops empty values, so `?q=&page=` reads as no search, page 1. */
export function nonEmpty(raw: Record<string, string | string[] | undefined>): Record<string, string> {
  return Object.fromEntries(Object.entries(raw).flatMap(([k, v]) => (typeof v === "string" && v !== "" ? [[k, v]] : [])));
}

/** A day as typed in a date input, YYYY-MM-DD; anything else is ignored. */
export const dayParam = z.string().regex(/^\d{4}-\d{2}-\d{2}$/).refine((d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`))).optional().catch(undefined);

/** The instant a day starts in a zone (midnight local time; the first instant of the day when midnight is skipped). */
export function dayStart(d: string | undefined, zone: string): Date | undefined {
  return d ? DateTime.fromISO(d, { zone: displayZoneOrUtc(zone) }).startOf("day").toJSDate() : undefined;
}
/** The instant the next day starts in a zone (for an inclusive "to"). */
export function dayEnd(d: string | undefined, zone: string): Date | undefined {
  return d ? DateTime.fromISO(d, { zone: displayZoneOrUtc(zone) }).startOf("day").plus({ days: 1 }).toJSDate() : undefined;
}
