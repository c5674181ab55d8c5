import { csvRow } from "./csv";
import { canonicalJson } from "./canonical";
import type { AuditEntryRecord } from "./audit";

/** An audit entry with what it is about, in words (lib/db/auditQueries resolves these). */
export interface AuditCsvEntry extends AuditEntryRecord {
  subject: { name: string | null; kind?: string; href: string | null };
  format: string | null;
}

const COLUMNS = ["seq", "at_utc", "action", "entity", "entity_id", "kind", "name", "link", "export_format", "actor", "details_json", "prev_hash", "hash"] as const;

export function auditCsvHeader(): string {
  return csvRow(COLUMNS);
}

/**
 * One entry as a CSV row. The raw id, the details as canonical JSON and both hashes are kept so the
 * file can be checked against the chain; names and actors go through csvRow, which neutralises
 * cells a spreadsheet would run as formulas.
 */
export function auditCsvRow(e: AuditCsvEntry, origin = ""): string {
  return csvRow([
    e.seq,
    e.at.toISOString(),
    e.action,
    e.entity,
    e.entityId,
    e.subject.kind ?? "",
    e.subject.name ?? "",
    e.subject.href ? `${origin}${e.subject.href}` : "",
    e.format ?? "",
    e.actor,
    canonicalJson(e.details),
    e.prevHash,
    e.hash,
  ]);
}
