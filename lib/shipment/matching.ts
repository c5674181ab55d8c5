// Which uploaded file belongs to which logger entry of a shipment: by the logger serial found in the file's
// metadata lines ("Logger serial: HX-20417"), else by a file-name pattern. The user confirms the result.
import type { MetadataLine } from "../trace/importCsv";

const SERIAL_KEY = /\b(serial|s\/n|sn|logger\s*id|device\s*id|seriennummer|n[°º]\s*de\s*s[ée]rie)\b/i;

/** The logger serial a file's metadata lines name, if any: the first key that says serial, its first word. */
export function serialFromMetadata(metadata: readonly MetadataLine[]): string | null {
  for (const m of metadata) {
    if (m.key && SERIAL_KEY.test(m.key)) {
      const v = /^[A-Za-z0-9][A-Za-z0-9._\-/]*/.exec(m.value.trim());
      if (v) return v[0];
    } else if (!m.key) {
      // "Logger serial HX-20417" written as one cell without a colon
      const v = /\bserial\s*(?:no\.?|number)?\s+([A-Za-z0-9][A-Za-z0-9._\-/]*)/i.exec(m.value);
      if (v) return v[1]!;
    }
  }
  return null;
}

export interface MatchTarget {
  /** the logger entry's id */
  id: string;
  serial?: string | null;
  /** a file-name pattern with * and ? wildcards, matched case-insensitively against the whole name */
  pattern?: string | null;
}

export interface FileToMatch {
  name: string;
  serial: string | null;
}

export interface FileMatch {
  file: string;
  target: string | null;
  by: "serial" | "file-name" | null;
}

/** A glob (* any run, ? one character) as a whole-name, case-insensitive regular expression. */
export function globRegExp(glob: string): RegExp {
  const body = glob.replace(/[.+^${}()|[\]\\]/g, "\\$&").replace(/\*/g, ".*").replace(/\?/g, ".");
  return new RegExp(`^${body}$`, "i");
}

/**
 * Proposes a logger entry for each file: an equal serial first (case-insensitive), then the first pattern
 * that matches the file name; an entry already taken by one file is not proposed for a second.
 */
export function matchFiles(files: readonly FileToMatch[], targets: readonly MatchTarget[]): FileMatch[] {
  const taken = new Set<string>();
  const out: FileMatch[] = files.map((f) => ({ file: f.name, target: null, by: null }));
  files.forEach((f, i) => {
    if (!f.serial) return;
    const t = targets.find((t) => !taken.has(t.id) && t.serial && t.serial.toLowerCase() === f.serial!.toLowerCase());
    if (t) {
      taken.add(t.id);
      out[i] = { file: f.name, target: t.id, by: "serial" };
    }
  });
  files.forEach((f, i) => {
    if (out[i]!.target) return;
    const t = targets.find((t) => !taken.has(t.id) && t.pattern && globRegExp(t.pattern).test(f.name));
    if (t) {
      taken.add(t.id);
      out[i] = { file: f.name, target: t.id, by: "file-name" };
    }
  });
  return out;
}
