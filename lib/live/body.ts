import { z } from "zod";
import type { LiveReading } from "./monitor";

/** Readings per request: a day of 1-second readings would be 86 400; a gateway sends far fewer at a time. */
export const MAX_READINGS_PER_BATCH = 10_000;
/** The plausible range of a reading, °C (the thresholds' range in lib/exposure/limits.ts). */
const MIN_C = -100, MAX_C = 200;

const celsius = (what: string) => z.number({ error: `${what} must be a number (°C)` }).finite({ message: `${what} must be a finite number` }).min(MIN_C, { message: `${what} below ${MIN_C} °C is not a plausible reading` }).max(MAX_C, { message: `${what} above ${MAX_C} °C is not a plausible reading` });

export const readingSchema = z.strictObject({
  t: z.iso
    .datetime({ offset: true, message: "t must be an ISO 8601 date-time with Z or an offset, e.g. 2026-06-09T14:05:00+02:00" })
    // as the importer: a date outside 1990–2100 is an unset logger clock, and closing the monitor would refuse it
    .refine((t) => Date.parse(t) >= Date.UTC(1990, 0, 1) && Date.parse(t) < Date.UTC(2101, 0, 1), { message: "t is outside 1990–2100: is the logger's clock set?" }),
  air_C: celsius("air_C"),
  probe_C: celsius("probe_C").optional(),
});

export interface ParsedReadings {
  /** the readings that passed, with their index in the request */
  valid: Array<{ index: number; reading: LiveReading }>;
  /** refused readings by index, with the reason */
  refused: Array<{ index: number; reason: string }>;
}

export type BodyOutcome = { ok: true; parsed: ParsedReadings } | { ok: false; message: string };

function check(items: unknown[]): ParsedReadings {
  const valid: ParsedReadings["valid"] = [];
  const refused: ParsedReadings["refused"] = [];
  items.forEach((item, index) => {
    const r = readingSchema.safeParse(item);
    if (!r.success) {
      const issue = r.error.issues[0]!;
      const field = issue.path.join(".");
      refused.push({ index, reason: field && !issue.message.startsWith(field) ? `${field}: ${issue.message}` : issue.message });
      return;
    }
    valid.push({ index, reading: { t_s: Date.parse(r.data.t) / 1000, air_C: r.data.air_C, ...(r.data.probe_C !== undefined ? { probe_C: r.data.probe_C } : {}) } });
  });
  return { valid, refused };
}

/** `{"readings": [{"t", "air_C", "probe_C"?}]}`: the envelope must be right; each reading is checked on its own. */
export function parseReadingsJson(text: string): BodyOutcome {
  let body: unknown;
  try {
    body = JSON.parse(text);
  } catch {
    return { ok: false, message: "the body is not valid JSON" };
  }
  const env = z.strictObject({ readings: z.array(z.unknown(), { error: "readings must be an array" }).min(1, { message: "readings is empty" }).max(MAX_READINGS_PER_BATCH, { message: `at most ${MAX_READINGS_PER_BATCH} readings per request` }) }).safeParse(body);
  if (!env.success) {
    const i = env.error.issues[0]!;
    return { ok: false, message: i.path.length ? `${i.path.join(".")}: ${i.message}` : i.message };
  }
  return { ok: true, parsed: check(env.data.readings) };
}

/**
 * The same columns as CSV: a header `t,air_C` or `t,air_C,probe_C`, then one reading per line (comma
 * separated, decimal point; an empty probe cell means no probe value). Row k of the data is reading index k.
 */
export function parseReadingsCsv(text: string): BodyOutcome {
  const lines = text.replace(/^\uFEFF/, "").split(/\r?\n/);
  while (lines.length && lines[lines.length - 1]!.trim() === "") lines.pop();
  const header = (lines.shift() ?? "").split(",").map((h) => h.trim());
  const cols = header.join(",");
  if (cols !== "t,air_C" && cols !== "t,air_C,probe_C") return { ok: false, message: `the CSV header must be "t,air_C" or "t,air_C,probe_C", not "${cols}"` };
  if (lines.length === 0) return { ok: false, message: "the CSV has no readings" };
  if (lines.length > MAX_READINGS_PER_BATCH) return { ok: false, message: `at most ${MAX_READINGS_PER_BATCH} readings per request` };
  const num = (cell: string): unknown => (/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(cell.trim()) ? Number(cell) : cell);
  const items = lines.map((line) => {
    const cells = line.split(",");
    if (cells.length !== header.length) return { __bad: `has ${cells.length} fields, the header ${header.length}` };
    const o: Record<string, unknown> = { t: cells[0]!.trim(), air_C: num(cells[1]!) };
    if (header.length === 3 && cells[2]!.trim() !== "") o.probe_C = num(cells[2]!);
    return o;
  });
  const parsed = check(items.map((o) => ("__bad" in o ? {} : o)));
  items.forEach((o, index) => {
    if ("__bad" in o) {
      const r = parsed.refused.find((x) => x.index === index)!;
      r.reason = `row ${index + 2} ${o.__bad as string}`;
    }
  });
  return { ok: true, parsed };
}
