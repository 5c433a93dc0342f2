import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import type { Knex } from "knex";
import { seedDemo, DEMO_PASSWORD, DEMO_USERS } from "@/db/seeds/demo";
import { launchBrowser } from "../support/browser";
import { testKnex, truncateAll } from "../support/db";
import { signInHttp } from "../support/session";
import { elfBytes, tinyPdf, tinyPng } from "../support/uploads";
import { LOCAL_UPLOAD_KEYS } from "@/lib/uploads/config";

const baseUrl = inject("baseUrl");
const shots = "tests/e2e/screenshots";

describe("a homeowner goes from an empty account to an open request with a sketch and photos", () => {
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

  async function save(page: Page, nextPath: RegExp) {
    await page.getByRole("button", { name: /^Save and/ }).click();
    await page.waitForURL(nextPath);
  }

  it("describes the system step by step, uploads, sees the loop check and posts a request", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    context.setDefaultTimeout(15_000);
    const page = await context.newPage();
    await page.goto(`${baseUrl}/sign-up`);
    await page.getByLabel("Your name").fill("Hollis Test");
    await page.getByLabel("E-mail").fill(`hollis.${Date.now()}@example.test`);
    await page.getByLabel("Password").fill("sunny-loft-copper-7");
    await page.getByRole("button", { name: "Create account" }).click();
    await page.waitForURL("**/dashboard");
    await page.getByRole("link", { name: "New project" }).first().click();
    await page.getByLabel("Project name").fill("Test house, roof loop");
    await page.getByRole("button", { name: "Start describing the system" }).click();
    await page.waitForURL(/\/edit\/site$/);
    const projectId = Number(page.url().match(/projects\/(\d+)/)![1]);

    // Site: a missing number is refused beside its field and nothing is lost.
    await page.getByLabel("Postcode area").fill("TQ9");
    await page.getByRole("button", { name: /^Save and/ }).click();
    await page.locator("#f-site-designMinTempC-error", { hasText: /Enter a number/ }).waitFor();
    expect(await page.getByLabel("Postcode area").inputValue()).toBe("TQ9");
    await page.getByLabel("Design minimum outdoor temperature").fill("-10");
    await save(page, /\/edit\/collectors$/);

    await page.getByLabel("Gross area, each").fill("2.3");
    await page.getByLabel("Aperture area, each").fill("2.1");
    await page.getByLabel("Fluid content, each").fill("1.6");
    await page.getByLabel("Tilt").fill("40");
    await save(page, /\/edit\/pipeRuns$/);

    await page.getByLabel("Length (flow and return together)").fill("26");
    await save(page, /\/edit\/pumpStation$/);

    await page.getByLabel("Static height, pump station to collector top").fill("8");
    await page.getByLabel("Flow meter range, from").fill("60");
    await page.getByLabel("Flow meter range, to").fill("480");
    await page.getByLabel("Circulator temperature rating").fill("110");
    await save(page, /\/edit\/expansionVessel$/);

    await page.getByLabel("Nominal volume").fill("8");
    await page.getByLabel("Pre-charge").fill("1.2");
    await page.getByLabel("Maximum pressure").fill("8");
    await page.getByLabel("Diaphragm temperature rating").fill("100");
    await save(page, /\/edit\/fluid$/);
    await save(page, /\/edit\/cylinder$/);

    await page.getByLabel("Cylinder volume").fill("210");
    await page.getByLabel("Coil content").fill("4.5");
    await save(page, /\/edit\/safety$/);
    await save(page, /\/edit\/design$/);
    await save(page, new RegExp(`/projects/${projectId}$`));

    // Drafts were saved step by step.
    const stored = await knex("projects")
      .where({ id: projectId })
      .first("system", "status", "region", "collector_type", "worst_level");
    expect(stored.status).toBe("ready");
    expect(stored.region).toBe("south-west");
    expect(stored.collector_type).toBe("flat_plate");

    // The loop check shows the undersized vessel.
    const vessel = page.locator('[data-finding="vessel-size"] [data-level]').first();
    expect(await vessel.getAttribute("data-level")).toBe("fix");

    // Sketch and two photos; a renamed executable is refused with a clear message.
    await page
      .locator("#sketch-file")
      .setInputFiles({ name: "loop-sketch.pdf", mimeType: "application/pdf", buffer: tinyPdf() });
    await page.getByText("Uploaded.").waitFor();
    await page.getByLabel("Photo caption").fill("Collectors on the south-west roof");
    await page
      .locator("#photo-file")
      .setInputFiles({ name: "roof.png", mimeType: "image/png", buffer: tinyPng() });
    await page.waitForFunction(() => document.querySelectorAll('[data-file="photo"]').length === 1);
    await page.getByLabel("Shows").selectOption("vessel");
    await page.getByLabel("Photo caption").fill("Vessel below the pump station");
    await page
      .locator("#photo-file")
      .setInputFiles({ name: "vessel.png", mimeType: "image/png", buffer: tinyPng() });
    await page.waitForFunction(() => document.querySelectorAll('[data-file="photo"]').length === 2);
    await page
      .locator("#photo-file")
      .setInputFiles({ name: "not-a-photo.png", mimeType: "image/png", buffer: elfBytes() });
    await page.getByText(/is not a JPEG, PNG or WebP image/).waitFor();
    expect(await page.locator('[data-file="sketch"]').count()).toBe(1);
    expect(await page.locator('[data-file="photo"]').count()).toBe(2);

    // Post a request (a site visit needs its window).
    await page.getByLabel("Site visit").check();
    await page
      .getByLabel("What do you want the reviewer to answer?")
      .fill("Is the vessel large enough for steam, and is the pre-charge right?");
    await page.getByLabel("Budget from").fill("80");
    await page.getByLabel("Budget up to").fill("150");
    await page.getByRole("button", { name: "Post the request" }).click();
    await page.locator("#f-windowStart-error", { hasText: /first date/ }).waitFor();
    const soon = new Date(Date.now() + 7 * 86_400_000).toISOString().slice(0, 10);
    const later = new Date(Date.now() + 21 * 86_400_000).toISOString().slice(0, 10);
    await page.getByLabel("Visit window from").fill(soon);
    await page.getByLabel("Visit window to").fill(later);
    await page.getByRole("button", { name: "Post the request" }).click();
    await page.getByText("Your request is on the board").waitFor();
    await page.reload();
    await page.getByText("Your request is on the board").waitFor();
    expect(await page.locator('[data-request="open"]').count()).toBe(1);
    const posted = await knex("requests")
      .where({ project_id: projectId })
      .first(
        "kind",
        "window_start",
        "window_end",
        "budget_min_minor",
        "budget_max_minor",
        "region",
        "status",
      );
    expect(posted).toMatchObject({
      kind: "site_visit",
      window_start: soon,
      window_end: later,
      budget_min_minor: 8000,
      budget_max_minor: 15000,
      region: "south-west",
      status: "open",
    });
    // Edit the open request.
    await page.getByText("Edit this request").click();
    await page.getByLabel("Budget up to").fill("160");
    await page.getByRole("button", { name: "Save changes" }).click();
    await page.getByText("Request updated.").waitFor();
    expect(
      (await knex("requests").where({ project_id: projectId }).first("budget_max_minor"))
        .budget_max_minor,
    ).toBe(16000);
    await page.screenshot({ path: `${shots}/homeowner-project.png`, fullPage: true });

    // Files are private: another homeowner gets 403, a verified reviewer may look while the request is open.
    const photoId = (
      await knex("attachments").where({ project_id: projectId, purpose: "photo" }).first("id")
    ).id;
    const other = await signInHttp(baseUrl, DEMO_USERS.homeowners[1].email, DEMO_PASSWORD);
    expect(
      (await fetch(`${baseUrl}/api/files/${photoId}`, { headers: { cookie: other.cookie } }))
        .status,
    ).toBe(403);
    const verified = await signInHttp(baseUrl, DEMO_USERS.reviewers[0].email, DEMO_PASSWORD);
    expect(
      (await fetch(`${baseUrl}/api/files/${photoId}`, { headers: { cookie: verified.cookie } }))
        .status,
    ).toBe(200);
    const pending = await signInHttp(baseUrl, DEMO_USERS.reviewers[2].email, DEMO_PASSWORD);
    expect(
      (await fetch(`${baseUrl}/api/files/${photoId}`, { headers: { cookie: pending.cookie } }))
        .status,
    ).toBe(403);
    // Another homeowner cannot open the project page either.
    const page2 = await fetch(`${baseUrl}/projects/${projectId}`, {
      headers: { cookie: other.cookie },
    });
    expect(page2.status).toBe(404);

    // Deleting the project deletes its files from the upload store too.
    const keys = (
      await knex("attachments").where({ project_id: projectId }).select("file_key")
    ).map((r) => r.file_key as string);
    expect(keys).toHaveLength(3);
    page.once("dialog", (d) => void d.accept());
    await page.getByRole("button", { name: "Delete this project" }).click();
    await page.waitForURL("**/dashboard");
    const listed = await fetch(`${inject("uploadUrl")}/v6/listFiles`, {
      method: "POST",
      headers: { "x-uploadthing-api-key": LOCAL_UPLOAD_KEYS.apiKey },
      body: "{}",
    });
    const stillStored = ((await listed.json()) as { files: { key: string }[] }).files.map(
      (f) => f.key,
    );
    for (const k of keys) expect(stillStored).not.toContain(k);
    await context.close();
  }, 120_000);
});
