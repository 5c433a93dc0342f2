/**
 * The review in Chromium at a tablet's width: the reviewer starts the review, works through the
 * checklist (every item autosaved), drops a pin on the sketch, writes the report and delivers;
 * the homeowner reads the report with the pin drawn on the sketch, prints it, and releases the
 * payment from the report page. The money is real on the payment fake (paid by checkout, paid
 * out on release) so the release goes all the way.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import type { Knex } from "knex";
import sharp from "sharp";
import { jobServices, startCheckout, type JobServices } from "@/lib/data/jobs";
import { startPayoutSetup } from "@/lib/data/payments";
import { parseJson } from "@/lib/data/json";
import { launchBrowser } from "../support/browser";
import { testKnex, truncateAll } from "../support/db";
import {
  FIXTURE_PASSWORD,
  makeHomeowner,
  makeJob,
  makeProject,
  makeReviewer,
} from "../support/fixtures";
import { TEST_PAYMENT_KEYS } from "../support/fakes";
import { paymentsFakeControl } from "../support/payments";
import { signInHttp } from "../support/session";
import { uploadViaApp } from "../support/uploads";

const baseUrl = inject("baseUrl");
const shots = "tests/e2e/screenshots";

describe("a remote design check from start to release", () => {
  let browser: Browser;
  let knex: Knex;
  let svc: JobServices;
  const fake = paymentsFakeControl(inject("paymentsUrl"), TEST_PAYMENT_KEYS.secretKey);
  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    await fake.reset();
    await fake.config({ webhookUrl: `${baseUrl}/api/webhooks/payments` });
    svc = jobServices({ pay: fake.client(), appUrl: baseUrl });
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await truncateAll(knex);
    await knex.destroy();
  });

  async function signIn(page: Page, email: string, path: string) {
    await page.goto(`${baseUrl}/sign-in?callbackUrl=${encodeURIComponent(path)}`);
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill(FIXTURE_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(`**${path}`);
  }

  it("the reviewer reviews and delivers; the homeowner reads the report with the pin and releases", async () => {
    // A reviewer whose payout account is set up on the fake's page.
    const reviewer = await makeReviewer(knex);
    await knex("reviewer_profiles")
      .where({ user_id: reviewer.id })
      .update({ payment_account_id: null, payouts_enabled: false });
    const setup = new URL(await startPayoutSetup(knex, reviewer, svc));
    await fetch(`${fake.base}${setup.pathname}`, {
      method: "POST",
      body: new URLSearchParams({ link: setup.searchParams.get("link")!, action: "complete" }),
      redirect: "manual",
    });
    await fake.flush();

    // The homeowner's project with a sketch uploaded through the app.
    const homeowner = await makeHomeowner(knex);
    const project = await makeProject(knex, homeowner, { title: "Hillside cottage loop" });
    const sketchPng = await sharp({
      create: { width: 900, height: 600, channels: 3, background: "#f1f5f9" },
    })
      .composite([
        {
          input: Buffer.from(
            '<svg width="900" height="600"><rect x="80" y="60" width="300" height="160" fill="#334155"/><rect x="600" y="380" width="120" height="180" fill="#9d4f25"/><line x1="230" y1="220" x2="660" y2="380" stroke="#0f172a" stroke-width="8"/></svg>',
          ),
        },
      ])
      .png()
      .toBuffer();
    const { cookie } = await signInHttp(baseUrl, homeowner.email, FIXTURE_PASSWORD);
    const up = await uploadViaApp(
      baseUrl,
      cookie,
      "sketch",
      { projectId: project.id },
      { name: "loop-sketch.png", type: "image/png", bytes: sketchPng },
    );
    expect(up.putBody?.serverData?.ok).toBe(true);

    // The job, paid through the fake's checkout; its webhook funds it.
    const job = await makeJob(knex, "awaiting_payment", { project, reviewer, priceMinor: 12_000 });
    await fake.payCheckout(await startCheckout(knex, homeowner, job.id, svc));
    await fake.flush();
    await expect
      .poll(async () => (await knex("jobs").where({ id: job.id }).first("state")).state)
      .toBe("funded");

    // The reviewer, on a tablet.
    const rc = await browser.newContext({ viewport: { width: 820, height: 1180 } });
    rc.setDefaultTimeout(15_000);
    const page = await rc.newPage();
    const log: string[] = [];
    page.on("console", (m) => log.push(`console ${m.type()}: ${m.text()}`));
    page.on("response", (r) => {
      if (r.status() >= 400) log.push(`${r.status()} ${r.url()}`);
    });
    page.on("dialog", (d) => void d.accept());
    await signIn(page, reviewer.email, `/jobs/${job.id}`);
    await page.getByRole("link", { name: "Start the review" }).click();
    await page.waitForURL(`**/jobs/${job.id}/review`);
    await page.getByRole("button", { name: "Start the review" }).click();
    await expect
      .poll(async () => (await knex("jobs").where({ id: job.id }).first("state")).state)
      .toBe("in_review");
    await page.reload();

    const items = page.locator("article[data-item]");
    const total = await items.count();
    expect(total).toBeGreaterThan(30);
    await expect
      .poll(() => page.getByTestId("progress").textContent())
      .toBe(`0 of ${total} items answered`);
    for (let i = 0; i < total; i++) {
      const item = items.nth(i);
      const key = await item.getAttribute("data-item");
      await item.getByText(key === "scald" ? "Concern" : "Sound", { exact: true }).click();
    }
    await expect
      .poll(() => page.getByTestId("progress").textContent())
      .toBe(`${total} of ${total} items answered`);
    // A second tab, opened now, falls behind when the first saves a note.
    const tabB = await rc.newPage();
    await tabB.goto(`${baseUrl}/jobs/${job.id}/review`);
    const scaldB = tabB.locator('article[data-item="scald"]');
    await scaldB.getByLabel(/^Note/).waitFor();
    const scald = page.locator('article[data-item="scald"]');
    await scald.getByLabel(/^Note/).fill("No **mixing valve** shown at the cylinder outlet.");
    await scald.getByText("✓ Saved").waitFor();
    await scaldB.getByLabel(/^Note/).fill("Tab B thinks it is fine.");
    await scaldB.getByText("Newer text from another tab").waitFor();
    expect(await scaldB.getByTestId("newer-text").innerText()).toContain(
      "No mixing valve shown at the cylinder outlet.",
    );
    await scaldB.screenshot({ path: `${shots}/review-conflict.png` });
    await scaldB.getByRole("button", { name: "Use the newer text" }).click();
    expect(await scaldB.getByLabel(/^Note/).inputValue()).toBe(
      "No **mixing valve** shown at the cylinder outlet.",
    );
    await tabB.close();

    // The JSON route says the same: a stale version is 409 with the saved text; bad input 422,
    // bad JSON 400, another role 403, signed out 401; nothing changes.
    const reviewerCookie = (await signInHttp(baseUrl, reviewer.email, FIXTURE_PASSWORD)).cookie;
    const put = (body: string, c = reviewerCookie) =>
      fetch(`${baseUrl}/api/jobs/${job.id}/answers/scald`, {
        method: "PUT",
        headers: { "content-type": "application/json", cookie: c },
        body,
      });
    const stale = await put(JSON.stringify({ noteMd: "Overwrite?", expectedVersion: 1 }));
    expect(stale.status).toBe(409);
    const staleBody = (await stale.json()) as { error: string; current: { noteMd: string } };
    expect(staleBody.current.noteMd).toBe("No **mixing valve** shown at the cylinder outlet.");
    expect(staleBody.error).toContain("changed in another tab");
    const bad = await put(JSON.stringify({ verdict: "great", expectedVersion: 2 }));
    expect(bad.status).toBe(422);
    expect((await put("{not json")).status).toBe(400);
    expect(
      (await put(JSON.stringify({ verdict: "sound", expectedVersion: 2 }), cookie)).status,
    ).toBe(403);
    expect((await put(JSON.stringify({ verdict: "sound", expectedVersion: 2 }), "")).status).toBe(
      401,
    );
    const scaldNow = await knex("checklist_answers as a")
      .join("reports as r", "r.id", "a.report_id")
      .where({ "r.job_id": job.id, "a.item_key": "scald" })
      .first("a.note_md", "a.verdict");
    expect(scaldNow).toEqual({
      note_md: "No **mixing valve** shown at the cylinder outlet.",
      verdict: "concern",
    });

    // Asking the homeowner for a fact about one item; the answer comes back beside it.
    const vessel = page.locator('article[data-item="vessel-rating"]');
    await vessel.getByRole("button", { name: "Ask the homeowner for a photo or a fact" }).click();
    await vessel.getByText("A fact", { exact: true }).click();
    await vessel
      .getByLabel("What you need from the homeowner")
      .fill("What maximum pressure and temperature does the vessel's rating plate give?");
    await vessel.getByRole("button", { name: "Send the question" }).click();
    await vessel.getByText("Waiting for the homeowner.").waitFor();
    const hc = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    hc.setDefaultTimeout(15_000);
    const home = await hc.newPage();
    home.on("dialog", (d) => void d.accept());
    await signIn(home, homeowner.email, `/projects/${project.id}`);
    const questions = home.locator("#reviewer-questions");
    await questions.getByText("about “Expansion vessel rating”").waitFor();
    await questions.getByLabel("Your answer").fill("The plate says 10 bar and 120 °C.");
    await questions.getByRole("button", { name: "Send the answer" }).click();
    await questions.getByText("✓ Answered: The plate says 10 bar and 120 °C.").waitFor();
    await questions.screenshot({ path: `${shots}/project-reviewer-questions.png` });
    await page.reload();
    await vessel.getByTestId("item-answer").getByText("10 bar and 120 °C").waitFor();

    await scald.getByRole("button", { name: "Pin on the sketch or a photo" }).click();
    await scald.getByLabel("Label for the next pin").fill("Hot outlet");
    const img = scald.locator("img[data-pin-target]");
    await img.waitFor();
    await expect.poll(() => img.evaluate((el) => (el as HTMLImageElement).naturalWidth)).toBe(900);
    const box = (await img.boundingBox())!;
    await img.click({ position: { x: box.width * 0.7, y: box.height * 0.75 } });
    await scald.locator('[data-pin="1"]').waitFor();
    await scald.getByText("✓ Saved").waitFor();
    await page.screenshot({ path: `${shots}/review-workspace-tablet.png`, fullPage: false });
    await scald.screenshot({ path: `${shots}/review-item-pin.png` });

    // Every answer is saved with its version.
    const saved = await knex("checklist_answers as a")
      .join("reports as r", "r.id", "a.report_id")
      .where("r.job_id", job.id)
      .select("a.item_key", "a.verdict", "a.pins", "a.version");
    expect(saved).toHaveLength(total);
    const scaldRow = saved.find((r) => r.item_key === "scald")!;
    expect(scaldRow.verdict).toBe("concern");
    const pins = parseJson(scaldRow.pins) as { x: number; y: number; label: string }[];
    expect(pins).toHaveLength(1);
    expect(pins[0]!.label).toBe("Hot outlet");
    expect(pins[0]!.x).toBeCloseTo(0.7, 1);
    expect(pins[0]!.y).toBeCloseTo(0.75, 1);

    // The report draft, then delivery.
    const draft = page.locator("#report-draft");
    await draft.getByText("Fix before filling", { exact: true }).click();
    await draft
      .getByLabel(/^Summary for the homeowner/)
      .fill("A sound design. Fit a mixing valve at the outlet before filling.");
    await draft.getByRole("button", { name: "Add a required change" }).click();
    await draft
      .getByLabel("Change 1: what to do")
      .fill("Fit a thermostatic mixing valve at the hot outlet.");
    await draft.getByLabel("Link change 1 to an item").selectOption("scald");
    await draft.getByText("✓ Everything needed is there.").waitFor();
    await draft.getByTestId("save-report").getByText("✓ Saved").waitFor();
    await draft.screenshot({ path: `${shots}/review-report-draft.png` });
    await draft.getByRole("button", { name: "Deliver the report" }).click();
    await page.waitForURL(`**/jobs/${job.id}/report`).catch((err) => {
      throw new Error(`${err}\n${log.join("\n")}`);
    });
    expect((await knex("jobs").where({ id: job.id }).first("state")).state).toBe("delivered");
    await rc.close();

    // The homeowner reads the report: outcome first, the pin on the sketch, and releases.
    await home.goto(`${baseUrl}/jobs/${job.id}/report`);
    const outcome = home.locator("[data-outcome]");
    await expect.poll(() => outcome.getAttribute("data-outcome")).toBe("fix_before_filling");
    expect(await outcome.textContent()).toContain("Fix before filling");
    expect(await home.getByTestId("required-changes").textContent()).toContain(
      "Fit a thermostatic mixing valve",
    );
    const pin = home.locator('[data-pin="1"]');
    await pin.waitFor();
    expect(await pin.getAttribute("aria-label")).toBe("Pin 1: Hot outlet");
    const sketch = home.locator("figure img").first();
    await expect
      .poll(() => sketch.evaluate((el) => (el as HTMLImageElement).naturalWidth))
      .toBe(900);
    const sb = (await sketch.boundingBox())!;
    const pb = (await pin.boundingBox())!;
    expect((pb.x + pb.width / 2 - sb.x) / sb.width).toBeCloseTo(0.7, 1);
    expect(await home.locator('[data-item="scald"] [data-verdict="concern"]').textContent()).toBe(
      "Concern",
    );
    expect(await home.locator('[data-item="scald"] strong').first().textContent()).toBe(
      "mixing valve",
    );
    expect(await home.getByText("Advisory only").count()).toBeGreaterThan(0);
    await home.screenshot({ path: `${shots}/report-homeowner.png`, fullPage: true });
    await home.emulateMedia({ media: "print" });
    await home.screenshot({ path: `${shots}/report-print.png`, fullPage: true });
    expect(await home.getByRole("button", { name: "Release the payment" }).isVisible()).toBe(false);
    await home.emulateMedia({ media: "screen" });
    await home.getByRole("button", { name: "Release the payment" }).click();
    await home
      .getByText("The payment is released to")
      .waitFor()
      .catch(async (err) => {
        await home.screenshot({ path: `${shots}/report-release-failed.png`, fullPage: true });
        throw new Error(`${err}\n${await home.locator(".no-print").last().innerText()}`);
      });
    expect((await knex("jobs").where({ id: job.id }).first("state")).state).toBe("released");
    await hc.close();
  }, 120_000);
});
