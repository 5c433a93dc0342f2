/**
 * Tried as a newcomer would, in Chromium at 1280 px and on a phone (390 × 844): the way in from
 * the header and footer, the phone menu, the footer at the bottom, the loop check's summary and
 * focus, the safety gate on posting with a `stop`, and the quote cards with Accept in view.
 */
import { mkdirSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import type { Knex } from "knex";
import { demoSystem } from "@/lib/calc/demo-system";
import { submitQuote } from "@/lib/data/quotes";
import { launchBrowser } from "../support/browser";
import { testKnex, truncateAll } from "../support/db";
import {
  FIXTURE_PASSWORD,
  makeHomeowner,
  makeProject,
  makeRequest,
  makeReviewer,
} from "../support/fixtures";

const baseUrl = inject("baseUrl");
const shots = "tests/e2e/screenshots";
const PHONE = { width: 390, height: 844 };
const DESKTOP = { width: 1280, height: 900 };

describe("a newcomer on a desktop and on a phone", () => {
  let browser: Browser;
  let knex: Knex;
  beforeAll(async () => {
    mkdirSync(shots, { recursive: true });
    knex = testKnex();
    await truncateAll(knex);
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await truncateAll(knex);
    await knex.destroy();
  });

  async function open(viewport: { width: number; height: number }) {
    const context = await browser.newContext({ viewport });
    context.setDefaultTimeout(15_000);
    return { context, page: await context.newPage() };
  }
  async function signIn(page: Page, email: string, path: string) {
    await page.goto(`${baseUrl}/sign-in?callbackUrl=${encodeURIComponent(path)}`);
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill(FIXTURE_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(`**${path}`);
  }

  it("desktop: sign in, sign up and a call to action per role from the landing page", async () => {
    const { context, page } = await open(DESKTOP);
    await page.goto(baseUrl);
    const header = page.getByRole("navigation", { name: "Main", exact: true });
    await expect(header.getByRole("link", { name: "Sign in" }).isVisible()).resolves.toBe(true);
    await expect(header.getByRole("link", { name: "Sign up" }).isVisible()).resolves.toBe(true);
    await expect(
      page.getByRole("link", { name: "Become a reviewer" }).count(),
    ).resolves.toBeGreaterThan(0);
    await expect(
      page.getByRole("link", { name: "Describe your loop" }).count(),
    ).resolves.toBeGreaterThan(0);
    const footer = page.getByRole("navigation", { name: "Footer" });
    await expect(footer.getByRole("link", { name: "Sign in" }).count()).resolves.toBe(1);
    await page.screenshot({ path: `${shots}/newcomer-landing-desktop.png`, fullPage: true });
    const icon = await fetch(`${baseUrl}/icon.svg`);
    expect(icon.status).toBe(200);
    expect((await fetch(`${baseUrl}/manifest.webmanifest`)).status).toBe(200);
    expect((await fetch(`${baseUrl}/social.png`)).status).toBe(200);
    await context.close();
  });

  it("phone: one header row with a menu button, the footer at the bottom of a short page", async () => {
    const { context, page } = await open(PHONE);
    await page.goto(baseUrl);
    const headerBox = await page.locator("header").first().boundingBox();
    expect(headerBox!.height).toBeLessThan(90);
    const menu = page.getByTestId("phone-menu");
    await menu.locator("summary").click();
    const signUp = page.getByRole("navigation", { name: "Main (phone)" }).getByRole("link", {
      name: "Sign up",
    });
    await expect(signUp.isVisible()).resolves.toBe(true);
    await page.screenshot({ path: `${shots}/newcomer-menu-phone.png` });
    await page.goto(`${baseUrl}/sign-in`);
    const footer = await page.locator("footer").boundingBox();
    expect(footer!.y + footer!.height).toBeGreaterThanOrEqual(PHONE.height - 1);
    // Nothing scrolls sideways.
    const wide = await page.evaluate(() => document.documentElement.scrollWidth);
    expect(wide).toBeLessThanOrEqual(PHONE.width);
    await context.close();
  });

  it("phone: the loop check keeps a summary in view, follows the fields, and focuses the results when run", async () => {
    const { context, page } = await open(PHONE);
    await page.goto(`${baseUrl}/loop-check`);
    const first = page.locator("input[type=number]").first();
    await first.scrollIntoViewIfNeeded();
    const summary = page.getByTestId("results-summary");
    await expect(summary.isVisible()).resolves.toBe(true);
    await page.screenshot({ path: `${shots}/newcomer-loop-check-phone.png` });
    await page.getByRole("button", { name: "Run the loop check" }).click();
    await page.waitForFunction(() => document.activeElement?.id === "results-title");
    // The results are scrolled into view, not left 3,000 px below the button.
    await page.waitForFunction((h) => {
      const r = document.getElementById("results-title")!.getBoundingClientRect();
      return r.top >= 0 && r.top < h;
    }, PHONE.height);
    await context.close();
  });

  it("phone: posting with a stop asks for the acknowledgement and suggests a site visit", async () => {
    const owner = await makeHomeowner(knex);
    const system = structuredClone(demoSystem);
    system.pumpStation = { ...system.pumpStation, lowestComponentMaxBar: 4 };
    const project = await makeProject(knex, owner, { system });
    const { context, page } = await open(PHONE);
    await signIn(page, owner.email, `/projects/${project.id}`);
    const gate = page.getByTestId("safety-gate");
    await gate.scrollIntoViewIfNeeded();
    await expect(gate.getByText("must not be filled or run").count()).resolves.toBe(1);
    await expect(
      gate.getByRole("button", { name: "Ask for a site visit instead" }).count(),
    ).resolves.toBe(1);
    await page
      .getByLabel("What do you want the reviewer to answer?")
      .fill("Is the pump station safe at this relief setting?");
    await page.getByLabel("Budget from").fill("60");
    await page.getByLabel("Budget up to").fill("150");
    await page.getByRole("button", { name: "Post the request" }).click();
    await page.locator("#f-acknowledgeStop-error", { hasText: /Confirm you have read/ }).waitFor();
    expect(await knex("requests").where({ project_id: project.id }).count({ n: "*" })).toEqual([
      { n: 0 },
    ]);
    await page.screenshot({ path: `${shots}/newcomer-safety-gate-phone.png`, fullPage: true });
    await page.getByLabel(/I have read why/).check();
    await page.getByRole("button", { name: "Post the request" }).click();
    await page.getByText("Your request is on the board").first().waitFor();
    expect(await knex("requests").where({ project_id: project.id }).count({ n: "*" })).toEqual([
      { n: 1 },
    ]);
    await context.close();
  });

  it("phone: quotes are cards with Accept in view; accepting asks first with the price", async () => {
    const owner = await makeHomeowner(knex);
    const reviewer = await makeReviewer(knex);
    const request = await makeRequest(knex, await makeProject(knex, owner));
    await submitQuote(knex, reviewer, request.id, {
      pricePounds: 95,
      turnaroundDays: 3,
      scopeMd: "Full checklist review with a written report.",
    });
    const { context, page } = await open(PHONE);
    await signIn(page, owner.email, `/requests/${request.id}`);
    const accept = page.getByRole("button", { name: /^Accept the quote from/ });
    const box = await accept.boundingBox();
    expect(box!.x + box!.width).toBeLessThanOrEqual(PHONE.width);
    await accept.click();
    const dialog = page.getByRole("dialog");
    await expect(dialog.getByText("What happens next").count()).resolves.toBe(1);
    await expect(dialog.getByRole("button", { name: /Accept for £95\.00/ }).count()).resolves.toBe(
      1,
    );
    await page.screenshot({ path: `${shots}/newcomer-accept-phone.png` });
    await dialog.getByRole("button", { name: "Go back" }).click();
    expect(await knex("jobs").where({ request_id: request.id }).count({ n: "*" })).toEqual([
      { n: 0 },
    ]);
    await context.close();
  });
});
