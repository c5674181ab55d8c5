import { TraceImportError } from "./errors";

export type TextEncodingName = "utf-8" | "utf-16le" | "utf-16be" | "windows-1252";

/**
 * Bytes to text, once. A byte-order mark selects UTF-8 or UTF-16 (LE/BE); otherwise strict UTF-8,
 * and when that fails, Windows-1252 (the usual encoding of older logger software, where the degree
 * sign is byte 0xB0). Bytes with NULs and no BOM are binary, not text, and are refused.
 */
export function decodeText(bytes: Uint8Array, encoding?: TextEncodingName): { text: string; encoding: TextEncodingName } {
  if (bytes.length === 0) throw new TraceImportError("the file is empty");
  const hasBom16le = bytes[0] === 0xff && bytes[1] === 0xfe;
  const hasBom16be = bytes[0] === 0xfe && bytes[1] === 0xff;
  const enc: TextEncodingName = encoding ?? (hasBom16le ? "utf-16le" : hasBom16be ? "utf-16be" : "utf-8");
  if (enc === "utf-16le" || enc === "utf-16be") {
    return { text: new TextDecoder(enc, { fatal: true }).decode(hasBom16le || hasBom16be ? bytes.subarray(2) : bytes), encoding: enc };
  }
  if (looksBinary(bytes.subarray(0, 65536))) throw new TraceImportError("the file is not text (it contains binary data); export the logger data as CSV");
  if (enc === "windows-1252") return { text: new TextDecoder("windows-1252").decode(bytes), encoding: enc };
  try {
    return { text: new TextDecoder("utf-8", { fatal: true }).decode(bytes), encoding: "utf-8" };
  } catch {
    if (encoding === "utf-8") throw new TraceImportError("the file is not valid UTF-8 text");
  }
  return { text: new TextDecoder("windows-1252").decode(bytes), encoding: "windows-1252" };
}

/** NUL bytes, or more than 1 % control characters other than tab, CR, LF and form feed: not a text export. */
function looksBinary(head: Uint8Array): boolean {
  let control = 0;
  for (const b of head) {
    if (b === 0) return true;
    if (b < 32 && b !== 9 && b !== 10 && b !== 13 && b !== 12) control++;
  }
  return control > Math.max(2, head.length / 100);
}
