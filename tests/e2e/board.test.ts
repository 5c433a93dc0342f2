import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser } from "playwright-core";
import type { Knex } from "knex";
import { seedDemo, DEMO_PASSWORD, DEMO_USERS } from "@/db/seeds/demo";
import { launchBrowser } from "../support/browser";
import { testKnex, truncateAll } from "../support/db";
import { signInHttp } from "../support/session";

const baseUrl = inject("baseUrl");

describe("the request board in Chromium", () => {
  let browser: Browser;
  let knex: Knex;
  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    await seedDemo(knex);
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await truncateAll(knex);
    await knex.destroy();
  });

  it("answers bad filters with 400 and the field", async () => {
    const sol = await signInHttp(baseUrl, DEMO_USERS.reviewers[0].email, DEMO_PASSWORD);
    const res = await fetch(`${baseUrl}/api/board?kind=roof&limit=900`, {
      headers: { cookie: sol.cookie },
    });
    expect(res.status).toBe(400);
    const body = (await res.json()) as { fieldErrors: Record<string, string[]> };
    expect(Object.keys(body.fieldErrors)).toEqual(expect.arrayContaining(["kind", "limit"]));
    expect((await fetch(`${baseUrl}/api/board`)).status).toBe(401);
    const home = await signInHttp(baseUrl, DEMO_USERS.homeowners[0].email, DEMO_PASSWORD);
    expect((await fetch(`${baseUrl}/api/board`, { headers: { cookie: home.cookie } })).status).toBe(
      403,
    );
  });

  it("checks the session token on the JSON route and the reviewer's row on every call", async () => {
    const get = (cookie: string) => fetch(`${baseUrl}/api/board`, { headers: { cookie } });
    // A forged or garbled token is signed out, not an error page.
    expect((await get("next-auth.session-token=not-a-token")).status).toBe(401);
    const sol = await signInHttp(baseUrl, DEMO_USERS.reviewers[0].email, DEMO_PASSWORD);
    expect((await get(sol.cookie)).status).toBe(200);
    // A pending reviewer holds a reviewer's token but is not verified.
    const dev = await signInHttp(baseUrl, DEMO_USERS.reviewers[2].email, DEMO_PASSWORD);
    expect((await get(dev.cookie)).status).toBe(403);
    // Suspended after signing in: the next call is refused, though the token is still valid.
    const id = (await knex("users").where({ email: DEMO_USERS.reviewers[0].email }).first("id")).id;
    await knex("reviewer_profiles").where({ user_id: id }).update({ suspended_at: knex.fn.now() });
    try {
      expect((await get(sol.cookie)).status).toBe(403);
    } finally {
      await knex("reviewer_profiles").where({ user_id: id }).update({ suspended_at: null });
    }
  });

  it("filters by kind with the filter kept in the URL", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    context.setDefaultTimeout(15_000);
    const page = await context.newPage();
    await page.goto(`${baseUrl}/sign-in`);
    await page.getByLabel("E-mail").fill(DEMO_USERS.reviewers[0].email);
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL("**/dashboard");
    await page.getByRole("link", { name: "Request board" }).click();
    await page.locator("[data-board-item]").first().waitFor();
    const open = await knex("requests").where({ status: "open" }).count({ n: "*" });
    expect(await page.locator("[data-board-item]").count()).toBe(Number(open[0]!.n));
    await page.getByLabel("Service").selectOption("site_visit");
    await page.getByRole("button", { name: "Show requests" }).click();
    await page.waitForURL(/kind=site_visit/);
    const sites = await knex("requests")
      .where({ status: "open", kind: "site_visit" })
      .count({ n: "*" });
    await page.waitForFunction(
      (n) => document.querySelectorAll("[data-board-item]").length === n,
      Number(sites[0]!.n),
    );
    const texts = await page.locator("[data-board-item]").allTextContents();
    expect(texts.every((t) => t.includes("Site visit"))).toBe(true);
    // Reloading keeps the filter (it lives in the URL).
    await page.reload();
    expect(await page.getByLabel("Service").inputValue()).toBe("site_visit");
    await page.locator("[data-board-item]").first().waitFor();
    await page.screenshot({ path: "tests/e2e/screenshots/board.png", fullPage: true });
    await context.close();
  });

  it("a reviewer opens a request and quotes; the homeowner compares and accepts", async () => {
    const request = await knex("requests as r")
      .join("users as u", "u.id", "r.homeowner_id")
      .where({ "r.status": "open", "r.kind": "remote_check" })
      .first("r.id", "u.email", "u.display_name");
    await knex("quotes").where({ request_id: request.id }).del();
    const reviewer = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    reviewer.setDefaultTimeout(15_000);
    const rp = await reviewer.newPage();
    await rp.goto(
      `${baseUrl}/sign-in?callbackUrl=${encodeURIComponent(`/requests/${request.id}`)}`,
    );
    await rp.getByLabel("E-mail").fill(DEMO_USERS.reviewers[1].email);
    await rp.getByLabel("Password").fill(DEMO_PASSWORD);
    await rp.getByRole("button", { name: "Sign in" }).click();
    await rp.waitForURL(`**/requests/${request.id}`);
    const body = await rp.content();
    expect(body).not.toContain(request.email);
    expect(body).not.toContain(request.display_name);
    await rp.getByLabel("Price").fill("0");
    await rp.getByLabel("Turnaround").fill("4");
    await rp
      .getByLabel("What the review covers")
      .fill("**Checklist review** of the sketch and photos, with a written report.");
    await rp.getByRole("button", { name: "Send quote" }).click();
    await rp.locator("#f-pricePounds-error", { hasText: /At least 10/ }).waitFor();
    await rp.getByLabel("Price").fill("120");
    await rp.getByRole("button", { name: "Send quote" }).click();
    await rp.getByText("Quote sent.").waitFor();

    const homeowner = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    homeowner.setDefaultTimeout(15_000);
    const hp = await homeowner.newPage();
    await hp.goto(
      `${baseUrl}/sign-in?callbackUrl=${encodeURIComponent(`/requests/${request.id}`)}`,
    );
    await hp.getByLabel("E-mail").fill(request.email);
    await hp.getByLabel("Password").fill(DEMO_PASSWORD);
    await hp.getByRole("button", { name: "Sign in" }).click();
    await hp.waitForURL(`**/requests/${request.id}`);
    expect(await hp.locator("strong:visible", { hasText: "Checklist review" }).count()).toBe(1);
    // A message from the reviewer appears on the homeowner's open page without a reload.
    await rp.reload();
    await rp
      .getByRole("textbox", { name: /^Message/ })
      .fill("Could you add a photo of the **vessel** connection?");
    await rp.getByRole("button", { name: "Send message" }).click();
    await hp
      .locator("[data-message]", { hasText: "Could you add a photo of the vessel connection?" })
      .waitFor({ timeout: 15_000 });
    // The comparison table sorts by price on a click, lowest first.
    await hp.getByRole("button", { name: /^Price/ }).click();
    expect(await hp.locator('th[aria-sort="ascending"]').count()).toBe(1);
    await hp.screenshot({ path: "tests/e2e/screenshots/quotes.png", fullPage: true });
    await hp.getByRole("button", { name: /^Accept the quote from/ }).click();
    // The confirmation names the price and what happens next before anything is sent.
    await hp.getByRole("dialog").getByText("What happens next").waitFor();
    await hp
      .getByRole("dialog")
      .getByRole("button", { name: /^Accept for / })
      .click();
    // Accepting leads straight to the job page, where paying into held funds is the next step.
    await hp.waitForURL(/\/jobs\/\d+$/);
    await hp.locator('[data-job-state="awaiting_payment"]').waitFor();
    await hp.getByRole("button", { name: /^Pay / }).waitFor();
    const job = await knex("jobs")
      .where({ request_id: request.id })
      .first("id", "state", "amount_minor");
    expect(job).toMatchObject({ state: "awaiting_payment", amount_minor: 12000 });
    expect(hp.url()).toMatch(new RegExp(`/jobs/${job.id}$`));
    await reviewer.close();
    await homeowner.close();
  });

  it("keeps only site visits within the distance typed on the board page, nearest first", async () => {
    // Invented geography: the reviewer's centre and three open site visits 15, 70 and 250 km
    // north of it (1° of latitude ≈ 111.2 km).
    const sol = await knex("users").where({ email: DEMO_USERS.reviewers[0].email }).first("id");
    await knex("reviewer_profiles")
      .where({ user_id: sol.id })
      .update({ centre_lat: 51.0, centre_lng: -2.0 });
    // Runs last: every request still open becomes a site visit, three of them with a point.
    await knex("requests")
      .where({ status: "open" })
      .update({ kind: "site_visit", window_start: "2030-05-01", window_end: "2030-06-30" });
    const visits = await knex("requests")
      .where({ status: "open" })
      .orderBy("id")
      .limit(3)
      .pluck("id");
    expect(visits).toHaveLength(3);
    const distances = [250, 15, 70];
    for (const [i, id] of visits.entries()) {
      await knex("requests")
        .where({ id })
        .update({ site_lat: 51.0 + distances[i]! / 111.2, site_lng: -2.0 });
    }
    // Any other open site visit has no point and so cannot be "within" a distance.
    await knex("requests")
      .where({ status: "open", kind: "site_visit" })
      .whereNotIn("id", visits)
      .update({ site_lat: null, site_lng: null });

    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    context.setDefaultTimeout(15_000);
    const page = await context.newPage();
    await page.goto(`${baseUrl}/sign-in?callbackUrl=${encodeURIComponent("/board")}`);
    await page.getByLabel("E-mail").fill(DEMO_USERS.reviewers[0].email);
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL("**/board");
    await page.locator("[data-board-item]").first().waitFor();
    await page.getByLabel("Site visits within (km)").fill("100");
    await page.getByLabel("Sort").selectOption("distance");
    await page.getByRole("button", { name: "Show requests" }).click();
    await page.waitForURL(/withinKm=100/);
    await page.waitForFunction(() => document.querySelectorAll("[data-board-item]").length === 2);
    const shown = await page
      .locator("[data-board-item]")
      .evaluateAll((els) => els.map((e) => Number(e.getAttribute("data-board-item"))));
    expect(shown).toEqual([visits[1], visits[2]]);
    const texts = await page.locator("[data-board-item]").allTextContents();
    expect(texts[0]).toMatch(/15 km away/);
    expect(texts[1]).toMatch(/70 km away/);
    await context.close();
  });
});
