import { createHash } from "node:crypto";

/** Hex SHA-256 of raw bytes: the identity of an uploaded file. */
export function sha256Hex(bytes: Uint8Array | string): string {
  return createHash("sha256").update(bytes).digest("hex");
}
