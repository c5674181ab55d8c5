/** Text as UTF-16 with a byte-order mark (LE or BE), as some logger software writes it. */
export function utf16(text: string, bigEndian: boolean): Uint8Array {
  const out = new Uint8Array(2 + text.length * 2);
  out.set(bigEndian ? [0xfe, 0xff] : [0xff, 0xfe]);
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    out[2 + 2 * i] = bigEndian ? c >> 8 : c & 0xff;
    out[3 + 2 * i] = bigEndian ? c & 0xff : c >> 8;
  }
  return out;
}
