// Ed25519 signatures of audit entries with Node's built-in crypto (RFC 8032 via OpenSSL).
// An entry's hash already covers every entry before it, so a valid signature on entry N vouches
// for entries 1…N as they were when N was written.
import { createHash, createPrivateKey, createPublicKey, sign, verify, type KeyObject } from "node:crypto";

/** What is signed: a fixed prefix (so the signature cannot be replayed for another purpose), the position and the hash. */
export function signedMessage(seq: number, hash: string): Buffer {
  return Buffer.from(`corelag-audit-entry-v1\n${seq}\n${hash}`, "utf8");
}

/** The raw 32-byte Ed25519 public key (RFC 8410 SPKI ends with it). */
export function rawPublicKey(key: KeyObject): Buffer {
  const spki = (key.type === "private" ? createPublicKey(key) : key).export({ format: "der", type: "spki" });
  return spki.subarray(spki.length - 32);
}

/** Hex SHA-256 of the raw public key: how a key is named everywhere (anchors, reports, the chain). */
export function keyFingerprint(key: KeyObject): string {
  return createHash("sha256").update(rawPublicKey(key)).digest("hex");
}

/** The first 16 hex digits in groups of four, for people to compare by eye. */
export function shortFingerprint(fp: string): string {
  return fp.slice(0, 16).replace(/(.{4})(?=.)/g, "$1 ");
}

/** A public key as stored in a "key" audit entry: base64 of the SPKI DER. */
export function publicKeyText(key: KeyObject): string {
  return (key.type === "private" ? createPublicKey(key) : key).export({ format: "der", type: "spki" }).toString("base64");
}

export function publicKeyFromText(text: string): KeyObject | null {
  try {
    const k = createPublicKey({ key: Buffer.from(text, "base64"), format: "der", type: "spki" });
    return k.asymmetricKeyType === "ed25519" ? k : null;
  } catch {
    return null;
  }
}

/** A private key from PEM text or base64 PKCS#8 DER; null when it is not an Ed25519 private key. */
export function privateKeyFromText(text: string): KeyObject | null {
  try {
    const t = text.trim();
    const k = t.startsWith("-----BEGIN") ? createPrivateKey(t) : createPrivateKey({ key: Buffer.from(t, "base64"), format: "der", type: "pkcs8" });
    return k.asymmetricKeyType === "ed25519" ? k : null;
  } catch {
    return null;
  }
}

export function signEntry(privateKey: KeyObject, seq: number, hash: string): string {
  return sign(null, signedMessage(seq, hash), privateKey).toString("base64");
}

export function verifyEntrySignature(publicKey: KeyObject, seq: number, hash: string, signature: string): boolean {
  try {
    return verify(null, signedMessage(seq, hash), publicKey, Buffer.from(signature, "base64"));
  } catch {
    return false;
  }
}
