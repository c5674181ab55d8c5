/** A Float64Array as bytes for a Bytes column (platform byte order: little-endian on every target here). */
export function float64ToBytes(a: Float64Array): Uint8Array<ArrayBuffer> {
  return new Uint8Array(a.buffer.slice(a.byteOffset, a.byteOffset + a.byteLength) as ArrayBuffer);
}

/** Bytes from a Bytes column back to a Float64Array; copies first, as the buffer may be unaligned. */
export function bytesToFloat64(u8: Uint8Array): Float64Array {
  if (u8.byteLength % 8 !== 0) throw new Error("stored series is corrupt: its length is not a whole number of 8-byte values");
  return new Float64Array(u8.slice().buffer);
}
