import { readFileSync } from "node:fs";
import http from "node:http";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Knex } from "knex";
import { seedDemo, DEMO_PASSWORD, DEMO_USERS } from "@/db/seeds/demo";
import { resetPassword } from "@/lib/data/accounts";
import { issueToken } from "@/lib/data/tokens";
import { testKnex, truncateAll } from "../support/db";
import { signInHttp } from "../support/session";

const baseUrl = inject("baseUrl");

interface Answer {
  status: number;
  text: string;
  setCookie: string[];
}

/**
 * One HTTP request from a chosen loopback source address (127.0.0.0/8 all reach the server), so
 * the test can be several clients; the app must see that address, not X-Forwarded-For.
 */
function send(
  path: string,
  o: { method?: string; headers?: Record<string, string>; body?: string | Buffer; from?: string },
): Promise<Answer> {
  const url = new URL(path, baseUrl);
  return new Promise((resolve, reject) => {
    const req = http.request(
      {
        host: url.hostname,
        port: url.port,
        path: url.pathname + url.search,
        method: o.method ?? "GET",
        headers: o.headers,
        localAddress: o.from ?? "127.0.0.1",
      },
      (res) => {
        const chunks: Buffer[] = [];
        res.on("data", (c: Buffer) => chunks.push(c));
        res.on("end", () =>
          resolve({
            status: res.statusCode ?? 0,
            text: Buffer.concat(chunks).toString("utf8"),
            setCookie: ([] as string[]).concat(res.headers["set-cookie"] ?? []),
          }),
        );
      },
    );
    req.on("error", reject);
    if (o.body) req.write(o.body);
    req.end();
  });
}

/** A credentials sign-in POST from `from`, on `path`, with a fresh CSRF token. */
async function signIn(email: string, password: string, from: string, path = "") {
  const csrf = await send("/api/auth/csrf", { from });
  const { csrfToken } = JSON.parse(csrf.text) as { csrfToken: string };
  const cookie = csrf.setCookie.map((c) => c.split(";")[0]).join("; ");
  return send(`/api/auth/callback/credentials${path}`, {
    method: "POST",
    from,
    headers: {
      "content-type": "application/x-www-form-urlencoded",
      cookie,
      // Sent by the client, so never trusted with TRUSTED_PROXY_HOPS=0.
      "x-forwarded-for": `10.9.${Math.floor(Math.random() * 250)}.${Math.floor(Math.random() * 250)}`,
    },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }).toString(),
  });
}

const sessionCookie = (a: Answer) =>
  a.setCookie.some((c) => /next-auth\.session-token=[^;]/.test(c));

describe("security probes against the built app", () => {
  let knex: Knex;
  const hana = DEMO_USERS.homeowners[0].email;
  const owen = DEMO_USERS.homeowners[1].email;
  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    await seedDemo(knex);
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  it("limits sign-in failures on every callback path, by the real address, without locking the user out", async () => {
    const attacker = "127.0.0.3";
    const paths = ["", "/x", "/a/b/c", "/credentials", "/x.json"];
    const statuses: number[] = [];
    for (let i = 0; i < 6; i++)
      statuses.push((await signIn(hana, `wrong-${i}`, attacker, paths[i % paths.length])).status);
    expect(statuses).toEqual([401, 401, 401, 401, 401, 401]);
    const blocked = await signIn(hana, DEMO_PASSWORD, attacker, "/anything");
    expect(blocked.status).toBe(429);
    expect(JSON.parse(blocked.text).error).toMatch(/Too many sign-in attempts/);
    expect(sessionCookie(blocked)).toBe(false);
    // The account holder, from their own address, still signs in.
    const real = await signIn(hana, DEMO_PASSWORD, "127.0.0.4");
    expect(real.status).toBe(200);
    expect(sessionCookie(real)).toBe(true);
  });

  it("never counts correct sign-ins against the limit", async () => {
    const from = "127.0.0.5";
    expect((await signIn(owen, "one-typo-here", from)).status).toBe(401);
    for (let i = 0; i < 10; i++) {
      const ok = await signIn(owen, DEMO_PASSWORD, from);
      expect(ok.status, `sign-in ${i + 1}`).toBe(200);
    }
  });

  it("answers a sign-in POST whose body is not the form with 400", async () => {
    for (const body of ['{"email":"a@b.test"}', "\u0000\u0001garbage"]) {
      const res = await send("/api/auth/callback/credentials", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body,
      });
      expect(res.status).toBe(400);
      expect(JSON.parse(res.text).error).toMatch(/sign-in form/);
    }
  });

  it("ends a copied session cookie at sign-out and at a password reset", async () => {
    const mira = DEMO_USERS.homeowners[2].email;
    const page = (cookie: string) =>
      send("/dashboard", { headers: { cookie } }).then((r) => r.status);
    const a = await signInHttp(baseUrl, mira, DEMO_PASSWORD);
    const copy = a.cookie;
    expect(await page(copy)).toBe(200);
    const { csrfToken } = (await (
      await fetch(`${baseUrl}/api/auth/csrf`, { headers: { cookie: a.cookie } })
    ).json()) as { csrfToken: string };
    const out = await fetch(`${baseUrl}/api/auth/signout`, {
      method: "POST",
      redirect: "manual",
      headers: { "content-type": "application/x-www-form-urlencoded", cookie: a.cookie },
      body: new URLSearchParams({ csrfToken, json: "true" }),
    });
    expect(out.status).toBeLessThan(400);
    expect(await page(copy)).toBe(307); // back to sign-in: the copy is no longer a session

    const b = await signInHttp(baseUrl, mira, DEMO_PASSWORD);
    expect(await page(b.cookie)).toBe(200);
    const user = await knex("users").where({ email: mira }).first("id");
    const token = await issueToken(knex, Number(user.id), "reset_password");
    await resetPassword(knex, {
      token,
      password: "another-long-passphrase",
      confirm: "another-long-passphrase",
    });
    expect(await page(b.cookie)).toBe(307);
  });

  it("refuses JSON nested 5,000 deep on the upload route with 400, signed out", async () => {
    const deep = "[".repeat(5000) + "]".repeat(5000);
    const res = await send("/api/uploadthing?slug=photo&actionType=upload", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: deep,
    });
    expect(res.status).toBe(400);
    expect(JSON.parse(res.text).error).toMatch(/nests too deeply/);
  });

  it("refuses a server action from a foreign origin with 403, and one over the size limit with 413", async () => {
    // A real action of the build (the sign-up form's), so Next.js itself would handle the POST.
    const manifest = JSON.parse(
      readFileSync(".next/server/server-reference-manifest.json", "utf8"),
    ) as { node: Record<string, { exportedName?: string }> };
    const action = Object.entries(manifest.node).find(([, a]) => a.exportedName === "signUp")![0];
    const foreign = await send("/sign-in", {
      method: "POST",
      headers: {
        "next-action": action,
        origin: "https://evil.example",
        "content-type": "text/plain;charset=UTF-8",
      },
      body: "[]",
    });
    expect(foreign.status).toBe(403);
    expect(foreign.text).toMatch(/another site/);
    const form = await send("/sign-up", {
      method: "POST",
      headers: {
        origin: "null",
        "content-type": "multipart/form-data; boundary=x",
      },
      body: '--x\r\nContent-Disposition: form-data; name="a"\r\n\r\nb\r\n--x--\r\n',
    });
    expect(form.status).toBe(403);
    const big = await send("/sign-in", {
      method: "POST",
      headers: {
        "next-action": action,
        origin: baseUrl,
        "content-type": "text/plain;charset=UTF-8",
        "content-length": String(1024 * 1024 + 10),
      },
      body: Buffer.alloc(1024 * 1024 + 10, "a"),
    });
    expect(big.status).toBe(413);
    expect(big.text).toMatch(/larger than 1 MB/);
    // Without a declared length the size is unknown until Next.js has read too much: refused.
    const chunked = await send("/sign-in", {
      method: "POST",
      headers: {
        "next-action": action,
        origin: baseUrl,
        "content-type": "text/plain;charset=UTF-8",
        "transfer-encoding": "chunked",
      },
      body: Buffer.alloc(1024 * 1024 + 10, "a"),
    });
    expect(chunked.status).toBe(411);
  });
});
