import { TraceImportError } from "./errors";

/**
 * Bytes to text. UTF-8 (with or without BOM) is the default; a UTF-16 BOM selects UTF-16.
 * Invalid UTF-8 is refused rather than replaced, so that nothing is silently changed.
 */
export function decodeText(bytes: Uint8Array): string {
  if (bytes.length === 0) throw new TraceImportError("the file is empty");
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return new TextDecoder("utf-16le").decode(bytes.subarray(2));
  if (bytes[0] === 0xfe && bytes[1] === 0xff) return new TextDecoder("utf-16be").decode(bytes.subarray(2));
  try {
    return new TextDecoder("utf-8", { fatal: true, ignoreBOM: false }).decode(bytes);
  } catch {
    throw new TraceImportError("the file is not valid UTF-8 or UTF-16 text (is it a spreadsheet or binary file?)");
  }
}
