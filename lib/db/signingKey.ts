// The audit signing key: never in the database. By default a PEM file created beside the database on
// first use, readable by its owner only; for teams, CORELAG_SIGNING_KEY (the key itself, from a secret
// store) or CORELAG_SIGNING_KEY_FILE (a path). See DEVELOPERS.md, "Records", for what it protects.
import { generateKeyPairSync, type KeyObject } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, statSync, unlinkSync, writeFileSync, renameSync } from "node:fs";
import path from "node:path";
import { signingKeySource } from "./env";
import { keyFingerprint, privateKeyFromText } from "../review/signature";

export interface SigningKey {
  privateKey: KeyObject;
  fingerprint: string;
  /** "environment" or the key file's path */
  source: string;
}

export class SigningKeyError extends Error {}

function fromText(text: string, source: string): SigningKey {
  const k = privateKeyFromText(text);
  if (!k) throw new SigningKeyError(`${source}: is not an Ed25519 private key (PEM or base64 PKCS#8)`);
  return { privateKey: k, fingerprint: keyFingerprint(k), source };
}

function readKeyFile(file: string): SigningKey {
  const mode = statSync(file).mode & 0o777;
  if (process.platform !== "win32" && (mode & 0o077) !== 0) {
    throw new SigningKeyError(`${file}: the signing key is readable by others (mode ${mode.toString(8)}); run chmod 600 on it`);
  }
  return fromText(readFileSync(file, "utf8"), file);
}

function newKeyPem(): string {
  return generateKeyPairSync("ed25519").privateKey.export({ format: "pem", type: "pkcs8" }).toString();
}

/**
 * The key to sign with. `create` makes the default key file when there is none (first start); without it
 * a missing key gives null (verify on a copied database, for instance).
 */
export function loadSigningKey(opts: { create: boolean }): SigningKey | null {
  const src = signingKeySource();
  if (src.kind === "env") return fromText(src.text, "CORELAG_SIGNING_KEY");
  if (existsSync(src.path)) return readKeyFile(src.path);
  if (!opts.create) return null;
  mkdirSync(path.dirname(src.path), { recursive: true });
  try {
    // "wx": never overwrite a key another process has just created.
    writeFileSync(src.path, newKeyPem(), { mode: 0o600, flag: "wx" });
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code !== "EEXIST") throw e;
  }
  return readKeyFile(src.path);
}

/**
 * Replaces the key file with a new key and returns both. The caller records the rotation in the chain,
 * signed by the old key, before calling `commit`; `abandon` removes the new key if that fails.
 * The old private key is deleted: entries it signed stay verifiable through the public key in the chain.
 */
export function prepareKeyRotation(): { old: SigningKey; next: SigningKey; commit: () => void; abandon: () => void } {
  const src = signingKeySource();
  if (src.kind === "env") throw new SigningKeyError("the signing key comes from CORELAG_SIGNING_KEY: rotate it in your secret store with CORELAG_SIGNING_KEY_FILE pointing at the new key, or unset it to use a key file");
  const old = loadSigningKey({ create: false });
  if (!old) throw new SigningKeyError(`${src.path}: there is no signing key to rotate yet`);
  const pending = `${src.path}.new`;
  writeFileSync(pending, newKeyPem(), { mode: 0o600 });
  const next = readKeyFile(pending);
  return {
    old,
    next: { ...next, source: src.path },
    commit: () => renameSync(pending, src.path),
    abandon: () => unlinkSync(pending),
  };
}
