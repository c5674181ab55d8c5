import { TraceImportError } from "./errors";

export type TextEncodingName = "utf-8" | "utf-16le" | "utf-16be" | "windows-1252";

const ASK = "save it as UTF-8 (or UTF-16), or choose the encoding in the import settings";

/**
 * Bytes to text, once. A byte-order mark selects UTF-8 or UTF-16 (LE/BE); otherwise strict UTF-8,
 * and when that fails, Windows-1252 (the usual encoding of older logger software, where the degree
 * sign is byte 0xB0) if the bytes read as Windows-1252 text; text in another encoding (Shift-JIS,
 * GBK, EUC-KR, …) is refused rather than garbled. Bytes with NULs and no BOM are binary, not text,
 * and are refused. Every failure is a TraceImportError saying what is wrong, never a decoder's TypeError.
 */
export function decodeText(bytes: Uint8Array, encoding?: TextEncodingName): { text: string; encoding: TextEncodingName } {
  if (bytes.length === 0) throw new TraceImportError("the file is empty");
  const hasBom16le = bytes[0] === 0xff && bytes[1] === 0xfe;
  const hasBom16be = bytes[0] === 0xfe && bytes[1] === 0xff;
  const enc: TextEncodingName = encoding ?? (hasBom16le ? "utf-16le" : hasBom16be ? "utf-16be" : "utf-8");
  if (enc === "utf-16le" || enc === "utf-16be") {
    if ((enc === "utf-16le" && hasBom16be) || (enc === "utf-16be" && hasBom16le)) {
      throw new TraceImportError(`the encoding chosen (${enc.toUpperCase()}) does not fit the file: it starts with a ${hasBom16le ? "UTF-16LE" : "UTF-16BE"} byte-order mark; leave the encoding to be detected`);
    }
    const body = (enc === "utf-16le" && hasBom16le) || (enc === "utf-16be" && hasBom16be) ? bytes.subarray(2) : bytes;
    const problem = utf16Problem(body, enc === "utf-16be", bytes.length - body.length);
    if (problem) {
      const chosen = encoding ? `the encoding chosen (${enc.toUpperCase()}) does not fit the file` : `the file starts with a ${enc.toUpperCase()} byte-order mark but is not valid ${enc.toUpperCase()}`;
      throw new TraceImportError(`${chosen}: ${problem}; ${encoding ? "choose another encoding, or leave it to be detected" : "the file may be cut short or damaged"}`);
    }
    return { text: new TextDecoder(enc).decode(body), encoding: enc };
  }
  if (hasBom16le || hasBom16be) {
    throw new TraceImportError(`the encoding chosen (${enc}) does not fit the file: it starts with a UTF-16 byte-order mark; choose UTF-16, or leave the encoding to be detected`);
  }
  if (looksBinary(bytes.subarray(0, 65536))) throw new TraceImportError("the file is not text (it contains binary data); export the logger data as CSV");
  if (enc === "windows-1252") return { text: new TextDecoder("windows-1252").decode(bytes), encoding: enc };
  const utf8 = decodeUtf8(bytes);
  if (utf8 !== null) return { text: utf8, encoding: "utf-8" };
  if (encoding === "utf-8") throw new TraceImportError(`the encoding chosen (UTF-8) does not fit the file: ${utf8Problem(bytes)}; choose another encoding, or leave it to be detected`);
  const foreign = notWindows1252(bytes);
  if (foreign) throw new TraceImportError(`the file is neither UTF-8 nor Windows-1252 text (${foreign}); it may be Shift-JIS, GBK, EUC-KR or another encoding Corelag does not read: ${ASK}`);
  return { text: new TextDecoder("windows-1252").decode(bytes), encoding: "windows-1252" };
}

function decodeUtf8(bytes: Uint8Array): string | null {
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    return null;
  }
}

/** Where strict UTF-8 decoding first fails, in words ("byte 0x93 at offset 12 is not valid UTF-8"). */
function utf8Problem(bytes: Uint8Array): string {
  let i = 0;
  while (i < bytes.length) {
    const b = bytes[i]!;
    const len = b < 0x80 ? 1 : b >= 0xc2 && b <= 0xdf ? 2 : b >= 0xe0 && b <= 0xef ? 3 : b >= 0xf0 && b <= 0xf4 ? 4 : 0;
    if (len === 0 || i + len > bytes.length) break;
    let ok = true;
    for (let k = 1; k < len; k++) if ((bytes[i + k]! & 0xc0) !== 0x80) ok = false;
    if (!ok || decodeUtf8(bytes.subarray(i, i + len)) === null) break;
    i += len;
  }
  return `byte 0x${(bytes[i] ?? 0).toString(16).padStart(2, "0")} at offset ${i} is not valid UTF-8`;
}

/**
 * Why the bytes are not UTF-16 text, or null when they are: an odd number of bytes, or a surrogate
 * without its partner (a high surrogate D800–DBFF must be followed by a low one DC00–DFFF). Byte
 * positions count from the start of the file (offset: the bytes before `bytes`, i.e. the byte-order mark).
 */
export function utf16Problem(bytes: Uint8Array, bigEndian: boolean, offset = 0): string | null {
  if (bytes.length % 2 !== 0) return `it has an odd number of bytes (${bytes.length + offset}), so its last character is cut in half`;
  const unit = (i: number) => (bigEndian ? (bytes[i]! << 8) | bytes[i + 1]! : bytes[i]! | (bytes[i + 1]! << 8));
  for (let i = 0; i < bytes.length; i += 2) {
    const u = unit(i);
    if (u >= 0xd800 && u <= 0xdbff) {
      if (i + 2 < bytes.length && unit(i + 2) >= 0xdc00 && unit(i + 2) <= 0xdfff) {
        i += 2;
        continue;
      }
      return `a lone surrogate 0x${u.toString(16)} at byte ${offset + i} has no partner`;
    }
    if (u >= 0xdc00 && u <= 0xdfff) return `a lone surrogate 0x${u.toString(16)} at byte ${offset + i} has no partner`;
  }
  return null;
}

/** The five byte values Windows-1252 leaves undefined. */
const UNDEFINED_1252 = new Set([0x81, 0x8d, 0x8f, 0x90, 0x9d]);

/**
 * Why bytes that are not UTF-8 are not Windows-1252 text either, or null when they read as it.
 * Western text in Windows-1252 has single non-ASCII characters between ASCII ones (°C, é, ö);
 * double-byte encodings (Shift-JIS, GBK, EUC-KR, Big5) put two bytes at or above 0x80 together for
 * most characters. So: an undefined byte, or at least two runs of two or more such bytes that hold
 * at least half of the file's non-ASCII bytes, means the text is in another encoding. ("Größe" is
 * one run; a Japanese header line has several.)
 */
export function notWindows1252(bytes: Uint8Array): string | null {
  let high = 0, inRuns = 0, runs = 0, run = 0;
  const endRun = () => {
    if (run >= 2) {
      runs++;
      inRuns += run;
    }
    run = 0;
  };
  for (let i = 0; i < bytes.length; i++) {
    const b = bytes[i]!;
    if (UNDEFINED_1252.has(b)) return `byte 0x${b.toString(16)} at offset ${i} is not a Windows-1252 character`;
    if (b >= 0x80) {
      high++;
      run++;
    } else endRun();
  }
  endRun();
  if (runs >= 2 && inRuns * 2 >= high) return `${inRuns} of its ${high} non-ASCII bytes come in multi-byte sequences`;
  return null;
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
