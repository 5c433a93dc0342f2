import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Knex } from "knex";
import { seedDemo, DEMO_PASSWORD, DEMO_USERS } from "@/db/seeds/demo";
import { testKnex, truncateAll } from "../support/db";
import { signInHttp } from "../support/session";

const baseUrl = inject("baseUrl");

describe("access rules over HTTP, with real sessions", () => {
  let knex: Knex;
  const cookies: Record<string, string> = {};
  let ownCredential: number;

  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    await seedDemo(knex);
    const [admin, home, sol, ines, dev] = await Promise.all([
      signInHttp(baseUrl, DEMO_USERS.admin.email, DEMO_PASSWORD),
      signInHttp(baseUrl, DEMO_USERS.homeowners[0].email, DEMO_PASSWORD),
      signInHttp(baseUrl, DEMO_USERS.reviewers[0].email, DEMO_PASSWORD),
      signInHttp(baseUrl, DEMO_USERS.reviewers[1].email, DEMO_PASSWORD),
      signInHttp(baseUrl, DEMO_USERS.reviewers[2].email, DEMO_PASSWORD),
    ]);
    Object.assign(cookies, {
      admin: admin.cookie,
      home: home.cookie,
      sol: sol.cookie,
      ines: ines.cookie,
      dev: dev.cookie,
    });
    const solId = (await knex("users").where({ email: DEMO_USERS.reviewers[0].email }).first("id"))
      .id;
    ownCredential = (await knex("credentials").where({ reviewer_id: solId }).first("id")).id;
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  const get = (path: string, who?: string) =>
    fetch(`${baseUrl}${path}`, {
      redirect: "manual",
      headers: who ? { cookie: cookies[who]! } : {},
    });

  it("sets an httpOnly, SameSite=Lax session cookie", async () => {
    const r = await signInHttp(baseUrl, DEMO_USERS.admin.email, DEMO_PASSWORD);
    const session = r.setCookie.find((c) => c.startsWith("next-auth.session-token="));
    expect(session).toMatch(/HttpOnly/i);
    expect(session).toMatch(/SameSite=Lax/i);
  });

  it("a credential as JSON: 401 signed out, 403 for a homeowner or another reviewer, 200 for its reviewer and admins", async () => {
    expect((await get(`/api/credentials/${ownCredential}`)).status).toBe(401);
    expect((await get(`/api/credentials/${ownCredential}`, "home")).status).toBe(403);
    expect((await get(`/api/credentials/${ownCredential}`, "ines")).status).toBe(403);
    const own = await get(`/api/credentials/${ownCredential}`, "sol");
    expect(own.status).toBe(200);
    expect(await own.json()).toMatchObject({ id: ownCredential, status: "verified" });
    expect((await get(`/api/credentials/${ownCredential}`, "admin")).status).toBe(200);
    expect((await get(`/api/credentials/999999`, "admin")).status).toBe(404);
    const bad = await get(`/api/credentials/abc`, "admin");
    expect(bad.status).toBe(400);
    expect(await bad.json()).toMatchObject({ error: expect.stringMatching(/whole number/) });
  });

  it("sends signed-out visitors of protected pages to sign-in", async () => {
    for (const path of [
      "/dashboard",
      "/admin/credentials",
      "/reviewer/credentials",
      "/settings/notifications",
    ]) {
      const res = await get(path);
      expect([302, 307]).toContain(res.status);
      expect(res.headers.get("location")).toMatch(/\/sign-in/);
    }
  });

  const REFUSED = "This page is not open to your account";

  it("answers the wrong role with our 403 page and status 403", async () => {
    const asHome = await get("/admin/credentials", "home");
    expect(asHome.status).toBe(403);
    expect(await asHome.text()).toContain(REFUSED);
    const asReviewer = await get("/admin/reviewers/1", "sol");
    expect(asReviewer.status).toBe(403);
    expect(await asReviewer.text()).toContain(REFUSED);
    const adminView = await get("/admin/credentials", "admin");
    expect(adminView.status).toBe(200);
    const html = await adminView.text();
    expect(html).toContain("Verification queue");
    expect(html).not.toMatch(new RegExp(`<h1[^>]*>${REFUSED}`));
  });

  it("answers an unknown page with our 404 page and status 404", async () => {
    const missing = await get("/projects/999999", "home");
    expect(missing.status).toBe(404);
    expect(await missing.text()).toContain("We could not find that");
    const nowhere = await get("/no-such-page");
    expect(nowhere.status).toBe(404);
    expect(await nowhere.text()).toContain("We could not find that page");
  });

  it("opens the board to verified reviewers only", async () => {
    expect(await (await get("/board", "sol")).text()).toContain("Request board");
    expect(await (await get("/board", "dev")).text()).toContain(
      "The request board is not open to you yet",
    );
    const asHome = await get("/board", "home");
    expect(asHome.status).toBe(403);
    expect(await asHome.text()).toContain(REFUSED);
  });

  it("limits sign-in failures per account and address with a 429", async () => {
    const email = DEMO_USERS.homeowners[3].email;
    const statuses: number[] = [];
    for (let i = 0; i < 10; i++)
      statuses.push((await signInHttp(baseUrl, email, "wrong-password-000")).status);
    expect(statuses).toContain(429);
    // SIGN_IN_LIMITS.perPair (5) failures pass; the 6th makes this pair wait, so the 7th is refused.
    expect(statuses.indexOf(429)).toBe(6);
    const res = await signInHttp(baseUrl, email, DEMO_PASSWORD);
    expect(res.status).toBe(429); // from this address even the right password waits (backoff)
  });
});
