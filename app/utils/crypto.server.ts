import { createHash, randomBytes } from "node:crypto";

/** A fresh random token of `bytes` bytes, base64url (32 bytes = 256 bits). */
export function randomToken(bytes = 32): string {
  return randomBytes(bytes).toString("base64url");
}

/** SHA-256 hex of a secret token: what we store, so a leaked database leaks no live token. */
export function hashToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}
