import { describe, expect, it } from "vitest";
import { decode, encode } from "next-auth/jwt";
import { decodeSessionToken, encodeSessionToken } from "@/lib/server/auth/jwt";

const secret = "a-test-secret-of-reasonable-length-0123456789";
const token = { uid: 42, role: "reviewer" as const, sv: 3, email: "r@example.test" };

describe("the session-token codec with a cached key", () => {
  it("opens tokens next-auth made, and next-auth opens the ones it makes", async () => {
    const fromNextAuth = await encode({ token, secret });
    expect(await decodeSessionToken({ token: fromNextAuth, secret })).toMatchObject(token);
    const ours = await encodeSessionToken({ token, secret });
    expect(await decode({ token: ours, secret })).toMatchObject(token);
    // The same salt rule as next-auth's (it salts the middleware's and the session's tokens alike).
    const salted = await encodeSessionToken({ token, secret, salt: "s" });
    expect(await decode({ token: salted, secret, salt: "s" })).toMatchObject(token);
    await expect(decode({ token: salted, secret })).rejects.toThrow();
  });

  it("sets the expiry from maxAge and refuses an expired token", async () => {
    const t = await encodeSessionToken({ token, secret, maxAge: 60 });
    const p = await decodeSessionToken({ token: t, secret });
    expect(Number(p!.exp) - Number(p!.iat)).toBe(60);
    expect(typeof p!.jti).toBe("string");
    const old = await encodeSessionToken({ token, secret, maxAge: -60 });
    await expect(decodeSessionToken({ token: old, secret })).rejects.toThrow(/exp/);
  });

  it("refuses a token made with another secret or changed on the way", async () => {
    const t = await encodeSessionToken({ token, secret });
    await expect(decodeSessionToken({ token: t, secret: `${secret}x` })).rejects.toThrow();
    const parts = t.split(".");
    parts[3] = `${parts[3]!.slice(0, -2)}AA`;
    await expect(decodeSessionToken({ token: parts.join("."), secret })).rejects.toThrow();
    expect(await decodeSessionToken({ token: "", secret })).toBeNull();
  });
});
