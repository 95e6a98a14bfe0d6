// Reading next-auth v4 session tokens without next-auth's per-call key derivation. A v4 session
// token is a JWE (alg "dir", enc "A256GCM") whose key is HKDF-SHA256 (RFC 5869) of the secret
// with an empty salt, the label "NextAuth.js Generated Encryption Key" and 32 bytes
// (next-auth/jwt `decode` → getDerivedEncryptionKey). next-auth derives that key again on every
// call, which was about 0.6 ms of server CPU per request here; the key depends only on the
// secret, so it is derived once. Decryption and the expiry check are jose's, with next-auth's
// 15 s clock tolerance. tests/unit/session-token.test.ts checks it against next-auth's own encode.
import { hkdfSync } from "node:crypto";
import { jwtDecrypt, type JWTPayload } from "jose";

let derived: { secret: string; key: Uint8Array } | null = null;

function sessionKey(secret: string): Uint8Array {
  if (derived?.secret !== secret) {
    derived = {
      secret,
      key: new Uint8Array(hkdfSync("sha256", secret, "", "NextAuth.js Generated Encryption Key", 32)),
    };
  }
  return derived.key;
}

/** The token's claims, or null when it does not decrypt with `secret` or has expired. */
export async function readSessionToken(token: string, secret: string): Promise<JWTPayload | null> {
  try {
    const { payload } = await jwtDecrypt(token, sessionKey(secret), { clockTolerance: 15 });
    return payload;
  } catch {
    return null;
  }
}
