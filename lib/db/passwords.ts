// Password hashing for accounts: argon2id from @node-rs/argon2 (a maintained binding of the reference
// implementation). better-auth is configured with these two functions (lib/db/auth.ts), and the user
// storage and the sign-off's password re-entry use them too, so there is one hashing scheme.
import { hash, verify } from "@node-rs/argon2";

/**
 * OWASP Password Storage Cheat Sheet (2023), argon2id: m = 19 MiB, t = 2, p = 1 is a listed minimum;
 * we use m = 19456 KiB, t = 2, p = 1. Algorithm 2 is argon2id in @node-rs/argon2's enum.
 */
const ARGON2ID = { algorithm: 2, memoryCost: 19_456, timeCost: 2, parallelism: 1 } as const;

export function hashPassword(password: string): Promise<string> {
  return hash(password, ARGON2ID);
}

/** Whether the password matches a stored `$argon2id$…` hash; a malformed hash is a mismatch, not a crash. */
export async function verifyPassword(stored: string, password: string): Promise<boolean> {
  try {
    return await verify(stored, password);
  } catch {
    return false;
  }
}
