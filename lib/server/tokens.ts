import "server-only";
import { createHash, randomBytes } from "node:crypto";

// Bearer tokens for invitations and run links: 256 bits from the OS CSPRNG, base64url in the
// URL, and only the SHA-256 stored so a copy of the database opens nothing.
export const TOKEN_BYTES = 32;

export function newToken(): { token: string; tokenHash: string } {
  const token = randomBytes(TOKEN_BYTES).toString("base64url");
  return { token, tokenHash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

/** Cheap shape check before touching the database: 32 bytes → 43 base64url characters. */
export function plausibleToken(token: string): boolean {
  return /^[A-Za-z0-9_-]{43}$/.test(token);
}
