/**
 * Journeys of a homeowner on their own, from a wiped database:
 *  1. sign up, confirm the address from the mail fake, describe the system through every
 *     step, upload a sketch and photos, read the loop check and post a remote design check;
 *  7. a homeowner whose loop check finds a `stop`: what they are told before posting.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import type { Knex } from "knex";
import sharp from "sharp";
import { demoSystem } from "@/lib/calc/demo-system";
import { launchBrowser, step } from "../support/browser";
import { testKnex, truncateAll } from "../support/db";
import { makeHomeowner, makeProject } from "../support/fixtures";
import { context, mailbox, shot, signedInPage, signUp, verifyEmail } from "../support/journey";
import { tinyPng } from "../support/uploads";

const baseUrl = inject("baseUrl");

describe("homeowner journeys in Chromium", () => {
  let browser: Browser;
  let knex: Knex;
  let mail: ReturnType<typeof mailbox>;
  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    mail = mailbox(knex);
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await truncateAll(knex);
    await knex.destroy();
  });

  async function save(page: Page, next: RegExp) {
    await page.getByRole("button", { name: /^Save and/ }).click();
    await page.waitForURL(next);
  }

  it("1: signs up, confirms the address, describes the system, uploads, checks and posts", async () => {
    const email = `hollis.${Date.now()}@example.test`;
    const ctx = await context(browser);
    const page = await ctx.newPage();

    await step("sign up", () =>
      signUp(page, baseUrl, { name: "Hollis Test", email, password: "sunny-loft-copper-7" }),
    );
    await step("confirm the address from the e-mail in the mail fake", async () => {
      await verifyEmail(page, baseUrl, mail, email);
      const row = await knex("users").where({ email }).first("email_verified_at");
      expect(row.email_verified_at).not.toBeNull();
    });

    let projectId = 0;
    await step("start a project", async () => {
      await page.goto(`${baseUrl}/dashboard`);
      await page.getByRole("link", { name: "New project" }).first().click();
      await page.getByLabel("Project name").fill("Journey house, roof loop");
      await page.getByRole("button", { name: "Start describing the system" }).click();
      await page.waitForURL(/\/edit\/site$/);
      projectId = Number(page.url().match(/projects\/(\d+)/)![1]);
    });

    await step("every step of the description", async () => {
      await page.getByLabel("Postcode area").fill("TQ9");
      await page.getByLabel("Design minimum outdoor temperature").fill("-10");
      await shot(page, "step-site");
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
      const row = await knex("projects").where({ id: projectId }).first("status");
      expect(row.status).toBe("ready");
    });

    await step("upload a sketch and two photos", async () => {
      const sketch = await sharp({
        create: { width: 600, height: 400, channels: 3, background: "#f1f5f9" },
      })
        .png()
        .toBuffer();
      await page
        .locator("#sketch-file")
        .setInputFiles({ name: "loop-sketch.png", mimeType: "image/png", buffer: sketch });
      await page.getByText("Uploaded.").waitFor();
      await page.getByLabel("Photo caption").fill("Collectors on the roof");
      await page
        .locator("#photo-file")
        .setInputFiles({ name: "roof.png", mimeType: "image/png", buffer: tinyPng() });
      await page.waitForFunction(
        () => document.querySelectorAll('[data-file="photo"]').length === 1,
      );
      await page.getByLabel("Shows").selectOption("vessel");
      await page.getByLabel("Photo caption").fill("Vessel below the pump station");
      await page
        .locator("#photo-file")
        .setInputFiles({ name: "vessel.png", mimeType: "image/png", buffer: tinyPng() });
      await page.waitForFunction(
        () => document.querySelectorAll('[data-file="photo"]').length === 2,
      );
      const tags = await knex("attachments")
        .where({ project_id: projectId, purpose: "photo" })
        .orderBy("id")
        .pluck("tag");
      expect(tags[1]).toBe("vessel");
    });

    await step("tag the vessel photo to the check it shows", async () => {
      const photoId = await knex("attachments")
        .where({ project_id: projectId, purpose: "photo", tag: "vessel" })
        .first("id");
      const vessel = page.locator('[data-guidance="vessel-rating"]');
      expect(await vessel.getAttribute("data-has-photo")).toBe("false");
      const tagForm = page.locator(`[data-photo-tags="${photoId.id}"]`);
      await tagForm.getByLabel("Expansion vessel rating").check();
      await tagForm.getByRole("button", { name: /Save the checks/ }).click();
      await tagForm.getByText("Saved: this photo shows 1 check.").waitFor();
      await expect.poll(() => vessel.getAttribute("data-has-photo")).toBe("true");
      expect(
        await knex("attachment_items").where({ attachment_id: photoId.id }).pluck("item_key"),
      ).toEqual(["vessel-rating"]);
    });

    await step("read the loop check", async () => {
      const results = page.getByTestId("loop-check-results");
      await results.waitFor();
      // The 8 L vessel is too small for this loop (the homeowner-project test's figures).
      expect(
        await page
          .locator('[data-finding="vessel-size"] [data-level]')
          .first()
          .getAttribute("data-level"),
      ).toBe("fix");
      expect(await results.innerText()).toContain("Loop check");
      await shot(page, "loop-check-project");
    });

    await step("post a remote design check", async () => {
      await page.getByLabel("Remote design check").check();
      await page
        .getByLabel("What do you want the reviewer to answer?")
        .fill("Is the vessel large enough for steam, and is the pre-charge right?");
      await page.getByLabel("Budget from").fill("80");
      await page.getByLabel("Budget up to").fill("150");
      await page.getByRole("button", { name: "Post the request" }).click();
      await page.getByText("Your request is on the board").waitFor();
      const posted = await knex("requests")
        .where({ project_id: projectId })
        .first("kind", "status", "budget_max_minor", "loop_check_snapshot");
      expect(posted).toMatchObject({
        kind: "remote_check",
        status: "open",
        budget_max_minor: 15000,
      });
      expect(posted.loop_check_snapshot).toBeTruthy();
      await shot(page, "project-posted");
    });
    await ctx.close();
  }, 120_000);

  it("7: a loop check with a `stop` says so, with the cautions, before posting", async () => {
    const owner = await makeHomeowner(knex);
    // A component rated below the relief valve's setting: the relief check is a `stop`
    // (lib/calc/loop-check.ts, relief level).
    const system = structuredClone(demoSystem);
    system.pumpStation!.lowestComponentMaxBar = 4;
    const project = await makeProject(knex, owner, { system, title: "Stop-level loop" });
    const page = await signedInPage(browser, baseUrl, owner.email, `/projects/${project.id}`);

    await step("the loop check shows the stop first, in words and an icon", async () => {
      const results = page.getByTestId("loop-check-results");
      await results.waitFor();
      expect(await results.locator("[data-level]").first().getAttribute("data-level")).toBe("stop");
      expect(await results.innerText()).toContain(
        "Stop: unsafe as described; the loop must not be filled or run",
      );
      expect(await results.locator('[data-finding] [data-level="stop"]').count()).toBeGreaterThan(
        0,
      );
    });
    await step("the cautions and the advisory line stand on the page", async () => {
      expect(await page.locator("#cautions-title").innerText()).toContain(
        "Before anyone goes up or fills anything",
      );
      expect(await page.getByText(/Advisory only/).count()).toBeGreaterThan(0);
    });
    await step("before posting", async () => {
      // The safety gate: the homeowner is told why, must confirm the loop will not be filled or
      // run, and is offered a site visit (the refusal without the tick: tests/e2e/newcomer.test.ts).
      const gate = page.getByTestId("safety-gate");
      await gate.waitFor();
      expect(await gate.getByText("must not be filled or run").count()).toBe(1);
      expect(await gate.getByRole("button", { name: "Ask for a site visit instead" }).count()).toBe(
        1,
      );
      expect(await page.getByLabel(/I have read why/).isChecked()).toBe(false);
      await page.getByRole("button", { name: "Post the request" }).waitFor();
      await shot(page, "project-stop");
    });
    await page.context().close();
  }, 60_000);
});
