import { hkdfSync, randomUUID } from "node:crypto";
import { EncryptJWT, jwtDecrypt } from "jose";
import type { JWT, JWTDecodeParams, JWTEncodeParams } from "next-auth/jwt";

/**
 * next-auth's session-token codec (an encrypted JWT: `dir` + A256GCM with a key derived from the
 * secret by HKDF-SHA256), written out so the derived key is worked out once per secret instead of
 * on every request: the derivation was about a tenth of the board route's CPU. The token format
 * is next-auth's own, byte for byte: tokens made by either codec open with the other
 * (tests/unit/session-jwt.test.ts), so sessions survive the switch.
 */
const DEFAULT_MAX_AGE = 30 * 24 * 60 * 60;
const keys = new Map<string, Uint8Array>();

function keyFor(secret: string | Buffer, salt = ""): Uint8Array {
  const id = `${salt}\u0000${secret.toString()}`;
  let key = keys.get(id);
  if (!key) {
    const info = `NextAuth.js Generated Encryption Key${salt ? ` (${salt})` : ""}`;
    key = new Uint8Array(hkdfSync("sha256", secret, salt, info, 32));
    keys.set(id, key);
  }
  return key;
}

export async function encodeSessionToken(params: JWTEncodeParams): Promise<string> {
  const { token = {}, secret, maxAge = DEFAULT_MAX_AGE, salt = "" } = params;
  const now = Math.floor(Date.now() / 1000);
  return new EncryptJWT(token)
    .setProtectedHeader({ alg: "dir", enc: "A256GCM" })
    .setIssuedAt()
    .setExpirationTime(now + maxAge)
    .setJti(randomUUID())
    .encrypt(keyFor(secret, salt));
}

export async function decodeSessionToken(params: JWTDecodeParams): Promise<JWT | null> {
  const { token, secret, salt = "" } = params;
  if (!token) return null;
  const { payload } = await jwtDecrypt(token, keyFor(secret, salt), { clockTolerance: 15 });
  return payload as JWT;
}
