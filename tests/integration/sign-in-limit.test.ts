/**
 * The sign-in limit of the auth route (app/api/auth/[...nextauth]/route.ts), without a build:
 * the route's POST is called with a real Request against the test database. The counters are
 * the shared ones in MariaDB (lib/data/rate-limit.ts), per account and per client address.
 */
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { hit, SIGN_IN_LIMITS } from "@/lib/data/rate-limit";
import { testKnex } from "../support/db";

type RoutePost = (
  req: Request,
  ctx: { params: Promise<{ nextauth: string[] }> },
) => Promise<Response>;

describe("the sign-in limit", () => {
  let knex: Knex;
  let POST: RoutePost;
  beforeAll(async () => {
    // The route reaches the database through db(): point it at the test database.
    process.env.DB_TARGET = "test";
    knex = testKnex();
    POST = (await import("@/app/api/auth/[...nextauth]/route")).POST as unknown as RoutePost;
  });
  beforeEach(async () => {
    await knex("rate_limit_hits").del();
  });
  afterAll(async () => {
    await knex("rate_limit_hits").del();
    await knex.destroy();
    const { getDb } = await import("@/lib/data/db");
    await getDb().destroy();
  });

  const attempt = (email: string, address = "198.51.100.7") =>
    POST(
      new Request("http://app.test/api/auth/callback/credentials", {
        method: "POST",
        headers: {
          "content-type": "application/x-www-form-urlencoded",
          "x-forwarded-for": `${address}, 10.0.0.1`,
        },
        body: new URLSearchParams({ email, password: "wrong-password-1", csrfToken: "x" }),
      }),
      { params: Promise.resolve({ nextauth: ["callback", "credentials"] }) },
    );
  /** The attempt as the route answers it; the handler behind the limit may fail outside Next. */
  const statusOf = async (p: Promise<Response>) => (await p.catch(() => null))?.status ?? null;
  const fill = async (bucket: string, n: number) => {
    for (let i = 0; i < n; i++) await hit(knex, bucket, 1000, SIGN_IN_LIMITS.windowMs);
  };
  const count = async (bucket: string) =>
    Number((await knex("rate_limit_hits").where({ bucket }).sum({ n: "hits" }))[0]!.n ?? 0);

  it("allows 8 attempts per account in 15 minutes and refuses the 9th with 429 and a plain message", async () => {
    expect(SIGN_IN_LIMITS).toEqual({ windowMs: 900_000, perAccount: 8, perAddress: 40 });
    const bucket = "signin:account:ada@example.test";
    await fill(bucket, 7);
    // The 8th (the address spelled with capitals and spaces counts for the same account) passes.
    expect(await statusOf(attempt("  Ada@Example.TEST "))).not.toBe(429);
    expect(await count(bucket)).toBe(8);
    const res = await attempt("ada@example.test");
    expect(res.status).toBe(429);
    const body = (await res.json()) as { error: string; url: string };
    expect(body.error).toBe("Too many sign-in attempts. Try again in a few minutes.");
    expect(body.url).toMatch(/\/sign-in\?error=RateLimited$/);
    const retry = Number(res.headers.get("retry-after"));
    expect(retry).toBeGreaterThan(0);
    expect(retry).toBeLessThanOrEqual(900);
    // Another account from another address is not held up by Ada's counter.
    expect(await statusOf(attempt("bob@example.test", "198.51.100.8"))).not.toBe(429);
  });

  it("refuses any account from an address past 40 attempts, reading the first forwarded address", async () => {
    await fill("signin:address:203.0.113.9", 40);
    const res = await attempt("new@example.test", "203.0.113.9");
    expect(res.status).toBe(429);
    expect(await count("signin:address:203.0.113.9")).toBe(41);
    expect(await count("signin:account:new@example.test")).toBe(1);
  });
});
