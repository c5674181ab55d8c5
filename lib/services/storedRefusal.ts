import type { z } from "zod";

/**
 * The message for a stored definition that no longer passes its schema (saved before a range or the
 * refusal of unknown fields came in): "the stored product 'Tray' v2 is no longer valid: field
 * 'mass_kg': mass must be between 0.001 and 2000 kg; save a corrected version".
 */
export function storedRefusal(noun: string, def: { name: string; version: number }, error: z.ZodError): string {
  const issue = error.issues[0]!;
  const where = issue.path.length ? `field '${issue.path.join(".")}': ` : "";
  return `the stored ${noun} '${def.name}' v${def.version} is no longer valid: ${where}${issue.message}; save a corrected version`;
}
