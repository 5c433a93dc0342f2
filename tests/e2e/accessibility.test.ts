/**
 * axe-core on every main page, in each role, against the production build. A serious or critical
 * violation fails the test and names the page, the rule and the first elements it found; the
 * counts per page are printed so the figures can be quoted.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, BrowserContext } from "playwright-core";
import type { Knex } from "knex";
import { AxeBuilder } from "@axe-core/playwright";
import { seedDemo, DEMO_PASSWORD, DEMO_USERS } from "@/db/seeds/demo";
import { systemSections } from "@/lib/validation/system";
import { launchBrowser, openContext, step } from "../support/browser";
import { testKnex, truncateAll } from "../support/db";

const baseUrl = inject("baseUrl");

interface PageResult {
  role: string;
  path: string;
  serious: number;
  moderate: number;
}
const results: PageResult[] = [];

describe("accessibility (axe-core) of the main pages in each role", () => {
  let browser: Browser;
  let knex: Knex;
  const ids: Record<string, number> = {};
  let visitOwnerEmail = "";

  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    await seedDemo(knex);
    browser = await launchBrowser();
    const hana = await knex("users").where({ email: DEMO_USERS.homeowners[0].email }).first("id");
    const sol = await knex("users").where({ email: DEMO_USERS.reviewers[0].email }).first("id");
    const project = await knex("projects").where({ owner_id: hana.id }).orderBy("id").first("id");
    const request = await knex("requests")
      .where({ homeowner_id: hana.id })
      .orderBy("id")
      .first("id");
    const open = await knex("requests").where({ status: "open" }).orderBy("id").first("id");
    const job = await knex("jobs").where({ homeowner_id: hana.id }).orderBy("id").first("id");
    // The review workspace, the report, the receipts and a site visit, from the demo's jobs.
    const review = await knex("jobs")
      .where({ reviewer_id: sol.id, state: "in_review" })
      .orderBy("id")
      .first("id");
    const reported = await knex("jobs")
      .where({ homeowner_id: hana.id })
      .whereIn("state", ["delivered", "released", "disputed", "partially_refunded"])
      .orderBy("id")
      .first("id");
    const solReported = await knex("jobs")
      .where({ reviewer_id: sol.id })
      .whereIn("state", ["delivered", "released", "disputed", "partially_refunded"])
      .orderBy("id")
      .first("id");
    const charge = await knex("ledger_entries as l")
      .join("jobs as j", "j.id", "l.job_id")
      .where({ "j.homeowner_id": hana.id, "l.kind": "charge" })
      .orderBy("l.id")
      .first("l.id", "l.job_id");
    const visit = await knex("jobs as j")
      .join("requests as r", "r.id", "j.request_id")
      .where({ "r.kind": "site_visit", "j.reviewer_id": sol.id })
      .orderBy("j.id")
      .first("j.id", "j.homeowner_id");
    const visitOwner = await knex("users").where({ id: visit.homeowner_id }).first("email");
    expect(review, "a demo job in review for the first reviewer").toBeDefined();
    expect(reported, "a demo job with a delivered report for the first homeowner").toBeDefined();
    Object.assign(ids, {
      review: review.id,
      reported: reported.id,
      solReported: solReported.id,
      chargeJob: charge.job_id,
      charge: charge.id,
      visit: visit.id,
    });
    visitOwnerEmail = visitOwner.email;
    Object.assign(ids, {
      hana: hana.id,
      sol: sol.id,
      project: project.id,
      request: request.id,
      open: open.id,
      job: job.id,
    });
  });
  afterAll(async () => {
    await browser?.close();
    await truncateAll(knex);
    await knex.destroy();
    const table = results
      .map((r) => `${r.role.padEnd(10)} ${r.path.padEnd(40)} serious+critical ${r.serious}`)
      .join("\n");
    console.log(`axe-core results (${results.length} pages)\n${table}`);
  });

  async function signedIn(email: string | null): Promise<BrowserContext> {
    // The app's CSP allows only scripts with its nonce; axe is injected by the test, so the
    // browser context bypasses the page's CSP (the app's own behaviour is unchanged).
    const context = await openContext(browser, { bypassCSP: true });
    if (email) {
      const page = await context.newPage();
      await page.goto(`${baseUrl}/sign-in`);
      await page.getByLabel("E-mail").fill(email);
      await page.getByLabel("Password").fill(DEMO_PASSWORD);
      await page.getByRole("button", { name: "Sign in" }).click();
      await page.waitForURL("**/dashboard");
      await page.close();
    }
    return context;
  }

  async function audit(context: BrowserContext, role: string, paths: string[]) {
    const failures: string[] = [];
    for (const path of paths) {
      const page = await context.newPage();
      const scan = await step(`${role} opens ${path}`, async () => {
        const res = await page.goto(`${baseUrl}${path}`);
        expect(res?.status(), `${role} ${path}`).toBeLessThan(400);
        await page.waitForLoadState("networkidle");
        return new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa"]).analyze();
      });
      const bad = scan.violations.filter((v) => v.impact === "serious" || v.impact === "critical");
      results.push({
        role,
        path,
        serious: bad.reduce((n, v) => n + v.nodes.length, 0),
        moderate: scan.violations.length - bad.length,
      });
      for (const v of bad)
        failures.push(
          `${role} ${path}: ${v.id} (${v.impact}) ${v.help} — ${v.nodes
            .slice(0, 3)
            .map((n) => n.target.join(" "))
            .join(", ")}`,
        );
      await page.close();
    }
    await context.close();
    expect(failures, failures.join("\n")).toEqual([]);
  }

  it("public pages, signed out", async () => {
    await audit(await signedIn(null), "anonymous", [
      "/",
      "/loop-check",
      "/sign-in",
      "/sign-up",
      "/forgot-password",
      `/reviewers/${ids.sol}`,
    ]);
  }, 120_000);

  it("the homeowner's pages", async () => {
    await audit(await signedIn(DEMO_USERS.homeowners[0].email), "homeowner", [
      "/dashboard",
      "/projects/new",
      `/projects/${ids.project}`,
      ...systemSections.map((s) => `/projects/${ids.project}/edit/${s}`),
      `/requests/${ids.request}`,
      `/jobs/${ids.job}`,
      `/jobs/${ids.reported}/report`,
      `/jobs/${ids.chargeJob}/receipts`,
      `/jobs/${ids.chargeJob}/receipts/${ids.charge}`,
      "/settings/notifications",
    ]);
  }, 120_000);

  it("the site visit, as its homeowner", async () => {
    await audit(await signedIn(visitOwnerEmail), "homeowner", [`/jobs/${ids.visit}`]);
  }, 120_000);

  it("the reviewer's pages", async () => {
    await audit(await signedIn(DEMO_USERS.reviewers[0].email), "reviewer", [
      "/dashboard",
      "/board",
      `/requests/${ids.open}`,
      `/jobs/${ids.job}`,
      `/jobs/${ids.review}/review`,
      `/jobs/${ids.solReported}/report`,
      `/jobs/${ids.visit}`,
      "/reviewer/profile",
      "/reviewer/credentials",
      "/reviewer/earnings",
    ]);
  }, 120_000);

  it("the admin's pages", async () => {
    await audit(await signedIn(DEMO_USERS.admin.email), "admin", [
      "/dashboard",
      "/admin/credentials",
      `/admin/reviewers/${ids.sol}`,
      "/admin/disputes",
      "/admin/ledger",
      "/admin/outbox",
      `/jobs/${ids.job}`,
    ]);
  }, 120_000);
});
