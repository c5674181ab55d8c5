// API tokens: 32 random bytes from the operating system's CSPRNG, written `clg_` + base64url (43
// characters). The token is shown once; only its SHA-256 is stored (a token has 256 bits of entropy, so a
// fast unsalted hash is enough: there is nothing to guess, unlike a password), with a short prefix that
// lets a person tell tokens apart in a list without being able to use it.
import { createHash, randomBytes, timingSafeEqual } from "node:crypto";

export const TOKEN_PREFIX = "clg_";
export const TOKEN_RANDOM_BYTES = 32;
/** characters of the token (after `clg_`) kept in the clear for identification: 8 base64url chars = 48 bits */
export const TOKEN_ID_CHARS = 8;
const TOKEN_SHAPE = /^clg_[A-Za-z0-9_-]{43}$/;
/**
 * Device tokens issued by monitors before they were API tokens (`cmd_` + 32 base64url characters), and the
 * demo monitor's fixed public token (lib/services/demoNames.ts): stored and checked like any token.
 */
const DEVICE_TOKEN_SHAPE = /^cmd_[A-Za-z0-9_-]{16,64}$/;

export interface NewToken {
  /** the secret, shown once */
  token: string;
  /** hex SHA-256 of the whole token string: what is stored */
  sha256: string;
  /** `clg_` and the first characters, for lists */
  prefix: string;
}

export function generateToken(random: (n: number) => Uint8Array = randomBytes): NewToken {
  const token = TOKEN_PREFIX + Buffer.from(random(TOKEN_RANDOM_BYTES)).toString("base64url");
  return { token, sha256: hashToken(token), prefix: tokenPrefix(token) };
}

export const hashToken = (token: string) => createHash("sha256").update(token, "utf8").digest("hex");
export const tokenPrefix = (token: string) => token.slice(0, TOKEN_PREFIX.length + TOKEN_ID_CHARS);
export const isTokenShaped = (text: string) => TOKEN_SHAPE.test(text) || DEVICE_TOKEN_SHAPE.test(text);

/** Constant-time comparison of two hex digests (the lookup is by hash; this guards the final check). */
export function sameDigest(a: string, b: string): boolean {
  const x = Buffer.from(a, "hex"), y = Buffer.from(b, "hex");
  return x.length === y.length && x.length > 0 && timingSafeEqual(x, y);
}

/**
 * The token of an `Authorization` header: `none` when there is no header, `malformed` when it is not
 * `Bearer <token>` with a token of the right shape (answered 401 without a database look-up).
 */
export function bearerToken(header: string | null | undefined): { kind: "none" } | { kind: "malformed" } | { kind: "token"; token: string } {
  if (header === null || header === undefined || header.trim() === "") return { kind: "none" };
  const m = /^Bearer\s+(\S+)\s*$/i.exec(header.trim());
  if (!m || !isTokenShaped(m[1]!)) return { kind: "malformed" };
  return { kind: "token", token: m[1]! };
}

export type TokenState = "active" | "expired" | "revoked";

/** Whether a stored token may be used at `now`. */
export function tokenState(t: { expiresAt: Date | null; revokedAt: Date | null }, now: Date): TokenState {
  if (t.revokedAt !== null) return "revoked";
  if (t.expiresAt !== null && t.expiresAt.getTime() <= now.getTime()) return "expired";
  return "active";
}
