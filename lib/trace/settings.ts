import { z } from "zod";
import { IANAZone } from "luxon";

/**
 * Import settings as a user (form, CLI flag) gives them. Everything left out is detected from the file;
 * the import then returns the *resolved* settings, which are stored with the trace so that a re-import
 * of the same bytes yields the identical series.
 */
export const importOptionsSchema = z.object({
  /** header name of the timestamp column */
  timeColumn: z.string().min(1).optional(),
  /** header name of the air-temperature column */
  airColumn: z.string().min(1).optional(),
  /** temperature unit of the air column; detected from the header when absent, else °C */
  unit: z.enum(["C", "F", "K"]).optional(),
  /** IANA zone for timestamps written without an offset */
  timeZone: z
    .string()
    .refine((z) => IANAZone.isValidZone(z), { message: "is not a known IANA time zone (e.g. Europe/Berlin)" })
    .optional(),
  /** field delimiter; detected when absent */
  delimiter: z.enum([",", ";", "\t", "|"]).optional(),
});
export type ImportOptions = z.infer<typeof importOptionsSchema>;

/** The settings an import actually used: complete, stored beside the trace. */
export const resolvedImportSettingsSchema = z.object({
  parser: z.literal("corelag-csv-1"),
  delimiter: z.enum([",", ";", "\t", "|"]),
  headerRow: z.number().int().positive(),
  timeColumn: z.string(),
  airColumn: z.string(),
  unit: z.enum(["C", "F", "K"]),
  timeZone: z.string(),
});
export type ResolvedImportSettings = z.infer<typeof resolvedImportSettingsSchema>;
