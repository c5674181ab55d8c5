import { sha256Hex } from "../trace/hash";

/** JSON with object keys sorted at every level: the same value always gives the same text. */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(value, (_key, v: unknown) => {
    if (v && typeof v === "object" && !Array.isArray(v) && !(v instanceof Uint8Array)) {
      return Object.fromEntries(Object.entries(v as Record<string, unknown>).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)));
    }
    return v;
  });
}

/** SHA-256 of a result and its predicted series: what "reproduces bit for bit" is checked against. */
export function resultHash(result: unknown, series: Float64Array): string {
  const bytes = new Uint8Array(series.buffer, series.byteOffset, series.byteLength);
  return sha256Hex(canonicalJson(result) + "\n" + sha256Hex(bytes));
}
