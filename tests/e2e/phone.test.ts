/**
 * The homeowner's pages on a phone (390 × 844 CSS pixels, touch): the project steps, the
 * uploads and the project page, the quote comparison, the job page and the report. On each:
 * no sideways scroll (document.scrollingElement.scrollWidth ≤ innerWidth), every button and
 * block link in the main content at least 44 × 44 px (WCAG 2.2 SC 2.5.5, target size
 * enhanced; links inside a sentence are exempt there too), and every table either stacked or
 * inside a horizontal scroller of its own that fits the screen.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import type { Knex } from "knex";
import { jobServices, type JobServices } from "@/lib/data/jobs";
import { systemSections } from "@/lib/validation/system";
import { launchBrowser, step } from "../support/browser";
import { testKnex, truncateAll } from "../support/db";
import { TEST_PAYMENT_KEYS } from "../support/fakes";
import {
  FIXTURE_PASSWORD,
  makeHomeowner,
  makeJob,
  makeProject,
  makeQuote,
  makeRequest,
  makeReviewer,
} from "../support/fixtures";
import {
  deliverThroughData,
  fundByCheckout,
  PHONE,
  shot,
  signedInPage,
  sketchPng,
} from "../support/journey";
import { paymentsFakeControl } from "../support/payments";
import { signInHttp } from "../support/session";
import { tinyPng, uploadViaApp } from "../support/uploads";

const baseUrl = inject("baseUrl");
const MIN_TARGET = 44;

interface LayoutReport {
  scrollWidth: number;
  innerWidth: number;
  smallTargets: string[];
  badTables: string[];
}

/** Measures the page as laid out now. */
function measure(page: Page): Promise<LayoutReport> {
  return page.evaluate((min) => {
    const main = document.querySelector("main")!;
    const describe = (el: Element) => {
      const r = el.getBoundingClientRect();
      const text = (el.textContent ?? el.getAttribute("aria-label") ?? "").trim().slice(0, 40);
      return `<${el.tagName.toLowerCase()}> "${text}" ${Math.round(r.width)}×${Math.round(r.height)}`;
    };
    const visible = (el: Element) => {
      const r = el.getBoundingClientRect();
      const s = getComputedStyle(el);
      return r.width > 1 && r.height > 1 && s.visibility !== "hidden" && !el.closest("[hidden]");
    };
    const targets = [...main.querySelectorAll("button, a[href], summary, select")].filter(visible);
    const smallTargets = targets
      .filter((el) => {
        // A link inside a sentence is exempt (WCAG 2.5.5's "inline" exception).
        if (el.tagName === "A" && getComputedStyle(el).display === "inline") return false;
        const r = el.getBoundingClientRect();
        return r.height < min || r.width < min;
      })
      .map(describe);
    const badTables = [...main.querySelectorAll("table")]
      .filter(visible)
      .filter((t) => {
        if (getComputedStyle(t).display !== "table") return false; // stacked rows
        let p = t.parentElement;
        while (p && p !== main) {
          const ox = getComputedStyle(p).overflowX;
          if (ox === "auto" || ox === "scroll") return p.getBoundingClientRect().width > innerWidth;
          p = p.parentElement;
        }
        return t.getBoundingClientRect().width > innerWidth;
      })
      .map(describe);
    return {
      scrollWidth: document.scrollingElement!.scrollWidth,
      innerWidth: window.innerWidth,
      smallTargets,
      badTables,
    };
  }, MIN_TARGET);
}

describe("the homeowner's pages on a phone", () => {
  let browser: Browser;
  let knex: Knex;
  let svc: JobServices;
  const fake = paymentsFakeControl(inject("paymentsUrl"), TEST_PAYMENT_KEYS.secretKey);
  const problems: string[] = [];
  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    await fake.config({ webhookUrl: `${baseUrl}/api/webhooks/payments` });
    svc = jobServices({ pay: fake.client(), appUrl: baseUrl });
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await truncateAll(knex);
    await knex.destroy();
  });

  async function check(page: Page, path: string, name?: string) {
    await step(`phone layout of ${path}`, async () => {
      const res = await page.goto(`${baseUrl}${path}`);
      expect(res?.status(), path).toBeLessThan(400);
      await page.waitForLoadState("networkidle");
      const m = await measure(page);
      expect(m.innerWidth).toBe(PHONE.width);
      if (m.scrollWidth > m.innerWidth)
        problems.push(`${path}: scrolls sideways (${m.scrollWidth} > ${m.innerWidth} px)`);
      for (const t of m.smallTargets) problems.push(`${path}: touch target under 44 px: ${t}`);
      for (const t of m.badTables)
        problems.push(`${path}: table neither stacked nor scrolled: ${t}`);
      if (name) await shot(page, name);
    });
  }

  it("steps, uploads, project, quotes, job and report fit a 390 px screen", async () => {
    // A delivered job with a sketch and a photo (for the pins and the report), and an open
    // request on another project of the same homeowner with two quotes.
    const reviewer = await makeReviewer(knex, { displayName: "Sol Brook" });
    const alex = await makeHomeowner(knex, { displayName: "Alex Morgan" });
    const project = await makeProject(knex, alex, { title: "Roof loop, two flat plates" });
    const job = await makeJob(knex, "awaiting_payment", { reviewer, project, priceMinor: 12_000 });
    const owner = job.homeowner;
    const { cookie } = await signInHttp(baseUrl, owner.email, FIXTURE_PASSWORD);
    const sketch = await sketchPng();
    for (const [slug, name, bytes] of [
      ["sketch", "sketch.png", sketch],
      ["photo", "roof.png", tinyPng()],
    ] as const) {
      const up = await uploadViaApp(
        baseUrl,
        cookie,
        slug,
        { projectId: job.project.id },
        {
          name,
          type: "image/png",
          bytes,
        },
      );
      expect(up.putBody?.serverData?.ok, `${slug} upload`).toBe(true);
    }
    await fundByCheckout(knex, owner, job.id, svc, fake);
    await deliverThroughData(knex, reviewer, job.id, baseUrl);
    const request = await makeRequest(knex, job.project);
    await makeQuote(knex, request, await makeReviewer(knex, { displayName: "Ada Quill" }), {
      priceMinor: 9_500,
    });
    await makeQuote(knex, request, await makeReviewer(knex, { displayName: "Bea Marsh" }), {
      priceMinor: 14_000,
    });

    const page = await signedInPage(browser, baseUrl, owner.email, "/dashboard", { phone: true });
    await check(page, "/dashboard");
    for (const s of systemSections)
      await check(
        page,
        `/projects/${job.project.id}/edit/${s}`,
        s === "site" ? "phone-step" : undefined,
      );
    await check(page, `/projects/${job.project.id}`, "phone-project");
    await check(page, `/requests/${request.id}`, "phone-quotes");
    await check(page, `/jobs/${job.id}`, "phone-job");
    await check(page, `/jobs/${job.id}/report`, "phone-report");
    await page.context().close();
    const distinct = [...new Set(problems)];
    expect(distinct, distinct.join("\n")).toEqual([]);
  }, 120_000);
});
