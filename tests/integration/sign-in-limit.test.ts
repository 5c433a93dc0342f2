/**
 * The sign-in limit of the auth route (app/api/auth/[...nextauth]/route.ts), without a build:
 * the route's POST is called with a real Request against the test database. The counters are
 * the shared ones in MariaDB (lib/data/rate-limit.ts), per account and address pair and per
 * address; the client address comes from the connection, never from X-Forwarded-For.
 */
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { recordSignInFailure, SIGN_IN_LIMITS } from "@/lib/data/rate-limit";
import { PEER_HEADER } from "@/lib/server/peer-address";
import { testKnex } from "../support/db";

type RoutePost = (
  req: Request,
  ctx: { params: Promise<{ nextauth: string[] }> },
) => Promise<Response>;

const APP = "http://app.test";

describe("the sign-in limit at the auth route", () => {
  let knex: Knex;
  let POST: RoutePost;
  beforeAll(async () => {
    // The route reaches the database through db(): point it at the test database.
    process.env.DB_TARGET = "test";
    knex = testKnex();
    POST = (await import("@/app/api/auth/[...nextauth]/route")).POST as unknown as RoutePost;
  });
  beforeEach(async () => {
    await knex("rate_limits").del();
  });
  afterAll(async () => {
    await knex("rate_limits").del();
    await knex.destroy();
    const { getDb } = await import("@/lib/data/db");
    await getDb().destroy();
  });

  const attempt = (email: string, peer: string, path = ["callback", "credentials"], xff = "") =>
    POST(
      new Request(`http://app.test/api/auth/${path.join("/")}`, {
        method: "POST",
        headers: {
          "content-type": "application/x-www-form-urlencoded",
          [PEER_HEADER]: peer,
          ...(xff ? { "x-forwarded-for": xff } : {}),
        },
        body: new URLSearchParams({ email, password: "wrong-password-1", csrfToken: "x" }),
      }),
      { params: Promise.resolve({ nextauth: path }) },
    );
  // The pair may fail `perPair` times; the failure after that makes it wait.
  const fail = async (email: string, peer: string, n: number) => {
    for (let i = 0; i < n; i++) await recordSignInFailure(knex, email, peer, APP);
  };

  it("holds an account and address pair after its consecutive failures, with a plain 429", async () => {
    await fail("ada@example.test", "198.51.100.7", SIGN_IN_LIMITS.perPair + 1);
    const res = await attempt("  Ada@Example.TEST ", "198.51.100.7");
    expect(res.status).toBe(429);
    const body = (await res.json()) as { error: string; url: string };
    expect(body.error).toBe("Too many sign-in attempts. Try again in a few minutes.");
    expect(body.url).toMatch(/\/sign-in\?error=RateLimited$/);
    const retry = Number(res.headers.get("retry-after"));
    expect(retry).toBeGreaterThan(0);
    expect(retry).toBeLessThanOrEqual(SIGN_IN_LIMITS.firstBackoffS);
  });

  it("limits every credentials path, not only the exact one", async () => {
    await fail("ada@example.test", "198.51.100.7", SIGN_IN_LIMITS.perPair + 1);
    const res = await attempt("ada@example.test", "198.51.100.7", [
      "callback",
      "credentials",
      "anything",
    ]);
    expect(res.status).toBe(429);
  });

  it("does not let X-Forwarded-For pick another address, nor lock the user out elsewhere", async () => {
    await fail("ada@example.test", "198.51.100.7", SIGN_IN_LIMITS.perPair + 1);
    // The same connection claiming another address through the header is still held…
    expect(
      (await attempt("ada@example.test", "198.51.100.7", undefined, "192.0.2.55")).status,
    ).toBe(429);
    // …while the real user from their own address is not (the handler behind the limit may
    // fail outside Next; what matters is that the limit let it through).
    const own = await attempt("ada@example.test", "192.0.2.20").catch(() => null);
    expect(own?.status ?? 0).not.toBe(429);
  });

  it("answers a body that is not the sign-in form with 400, not 500", async () => {
    const res = await POST(
      new Request("http://app.test/api/auth/callback/credentials", {
        method: "POST",
        headers: { "content-type": "application/json", [PEER_HEADER]: "198.51.100.9" },
        body: JSON.stringify({ email: "x" }),
      }),
      { params: Promise.resolve({ nextauth: ["callback", "credentials"] }) },
    );
    expect(res.status).toBe(400);
  });
});
