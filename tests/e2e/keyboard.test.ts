/**
 * The homeowner's project steps done with the keyboard alone: sign in, go through every step
 * with Tab and Enter, and on a refused value land on the field in error with its message tied
 * to it. Then a reviewer completes the review workspace the same way: a verdict per item with
 * Space, a pin placed with the arrow keys and Enter, the summary typed, delivered with Enter.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import type { Knex } from "knex";
import { SECTIONS } from "@/lib/validation/system-fields";
import { launchBrowser, openContext, step } from "../support/browser";
import { testKnex, truncateAll } from "../support/db";
import sharp from "sharp";
import { parseJson } from "@/lib/data/json";
import {
  FIXTURE_PASSWORD,
  makeHomeowner,
  makeJob,
  makeProject,
  makeReviewer,
} from "../support/fixtures";
import { answerThroughData } from "../support/journey";
import { signInHttp } from "../support/session";
import { uploadViaApp } from "../support/uploads";

const baseUrl = inject("baseUrl");

/**
 * Press Tab until the focused element matches the CSS selector (and starts with the text, when
 * one is given), or fail after `max` presses.
 */
async function tabTo(
  page: Page,
  selector: string,
  text = "",
  max = 150,
  key: "Tab" | "Shift+Tab" = "Tab",
): Promise<void> {
  for (let i = 0; i < max; i++) {
    await page.keyboard.press(key);
    const ok = await page.evaluate(
      ([sel, prefix]) => {
        const el = document.activeElement;
        return !!el && el.matches(sel!) && (el.textContent ?? "").trim().startsWith(prefix!);
      },
      [selector, text],
    );
    if (ok) return;
  }
  throw new Error(`no ${selector} "${text}" reached with ${key} within ${max} presses`);
}

describe("the project steps with the keyboard alone", () => {
  let browser: Browser;
  let knex: Knex;
  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await truncateAll(knex);
    await knex.destroy();
  });

  it("signs in, walks every step with Tab and Enter, and lands on the field in error", async () => {
    const owner = await makeHomeowner(knex);
    const project = await makeProject(knex, owner);
    const context = await openContext(browser);
    const page = await context.newPage();

    await step("sign in with the keyboard", async () => {
      await page.goto(`${baseUrl}/sign-in`);
      await tabTo(page, 'input[type="email"]');
      await page.keyboard.type(owner.email);
      await page.keyboard.press("Tab");
      await page.keyboard.type(FIXTURE_PASSWORD);
      await page.keyboard.press("Enter");
      await page.waitForURL("**/dashboard");
    });

    await step("a refused value takes the focus, with its message", async () => {
      await page.goto(`${baseUrl}/projects/${project.id}/edit/collectors`);
      await tabTo(page, 'input[type="number"]');
      await page.keyboard.press("Control+A");
      await page.keyboard.type("-5");
      // Submit from the button, so the focus has to travel back to the field in error.
      await tabTo(page, 'button[type="submit"]', "Save");
      await page.keyboard.press("Enter");
      await page.waitForFunction(
        () => document.activeElement?.getAttribute("aria-invalid") === "true",
      );
      const message = await page.evaluate(() => {
        const id = document.activeElement?.getAttribute("aria-describedby");
        return id ? document.getElementById(id.split(" ")[0]!)?.textContent : null;
      });
      expect(message?.trim().length).toBeGreaterThan(0);
      // Nothing was saved: the stored description still has the fixture's value.
      const row = await knex("projects").where({ id: project.id }).first("system");
      const saved = (
        typeof row.system === "string" ? JSON.parse(row.system) : row.system
      ) as typeof project.system;
      expect(saved.collectors).toEqual(project.system.collectors);
    });

    for (const [i, section] of SECTIONS.entries()) {
      await step(`save the ${section.title} step with Enter on its button`, async () => {
        await page.goto(`${baseUrl}/projects/${project.id}/edit/${section.id}`);
        await tabTo(page, 'button[type="submit"]', "Save");
        await page.keyboard.press("Enter");
        const next = SECTIONS[i + 1];
        await page.waitForURL(
          next
            ? `**/projects/${project.id}/edit/${next.id}`
            : new RegExp(`/projects/${project.id}$`),
        );
      });
    }
    await context.close();
  }, 180_000);

  it("a reviewer completes the review workspace, pin included, with the keyboard alone", async () => {
    const reviewer = await makeReviewer(knex);
    const owner = await makeHomeowner(knex);
    const project = await makeProject(knex, owner);
    const { cookie } = await signInHttp(baseUrl, owner.email, FIXTURE_PASSWORD);
    const sketch = await sharp({
      create: { width: 800, height: 500, channels: 3, background: "#e2e8f0" },
    })
      .png()
      .toBuffer();
    const up = await uploadViaApp(
      baseUrl,
      cookie,
      "sketch",
      { projectId: project.id },
      {
        name: "sketch.png",
        type: "image/png",
        bytes: sketch,
      },
    );
    expect(up.putBody?.serverData?.ok).toBe(true);
    const job = await makeJob(knex, "in_review", { project, reviewer });
    const context = await openContext(browser);
    const page = await context.newPage();
    page.on("dialog", (d) => void d.accept());

    await step("sign in with the keyboard", async () => {
      await page.goto(
        `${baseUrl}/sign-in?callbackUrl=${encodeURIComponent(`/jobs/${job.id}/review`)}`,
      );
      await tabTo(page, 'input[type="email"]');
      await page.keyboard.type(reviewer.email);
      await page.keyboard.press("Tab");
      await page.keyboard.type(FIXTURE_PASSWORD);
      await page.keyboard.press("Enter");
      await page.waitForURL(`**/jobs/${job.id}/review`);
      await page.locator("article[data-item]").first().waitFor();
    });

    // The first section's items and the scald item are answered here with the keyboard; the
    // rest were saved beforehand through the autosave's own function, to keep the suite short.
    const { first, scaldSection } = await page.evaluate(() => ({
      first: [
        ...document.querySelector("section[id^=section-]")!.querySelectorAll("article[data-item]"),
      ].map((e) => e.getAttribute("data-item")!),
      scaldSection: document.querySelector('article[data-item="scald"]')!.closest("section")!.id,
    }));
    const keys = await page
      .locator("article[data-item]")
      .evaluateAll((els) => els.map((e) => e.getAttribute("data-item")!));
    await answerThroughData(knex, reviewer, job.id, [...first, "scald"]);
    await page.reload();
    await page.locator("article[data-item]").first().waitFor();
    for (const key of first) {
      await step(`verdict for ${key} with Space`, async () => {
        await tabTo(page, `article[data-item="${key}"] input[type="radio"]`);
        await page.keyboard.press("Space");
      });
    }
    await step("to the scald item's section by its link, its verdict and a pin", async () => {
      // Back up to the sticky progress bar and take the section's link.
      await tabTo(page, `a[href="#${scaldSection}"]`, "", 150, "Shift+Tab");
      await page.keyboard.press("Enter");
      await tabTo(page, 'article[data-item="scald"] input[type="radio"]');
      await page.keyboard.press("ArrowRight"); // Sound → Concern
      await tabTo(page, 'article[data-item="scald"] button', "Pin on the sketch or a photo");
      await page.keyboard.press("Enter");
      await tabTo(page, 'article[data-item="scald"] [data-pin-keyboard]');
      for (let i = 0; i < 4; i++) await page.keyboard.press("ArrowLeft");
      await page.keyboard.press("Shift+ArrowUp");
      await page.keyboard.press("Enter");
      await page.locator('article[data-item="scald"] [data-pin="1"]').waitFor();
    });
    await step("every item answered", () =>
      expect
        .poll(() => page.getByTestId("progress").textContent())
        .toBe(`${keys.length} of ${keys.length} items answered`),
    );
    await step("the report: outcome, summary, delivery with Enter", async () => {
      // On from the scald item, past the section's last items, to the report.
      await tabTo(page, '#report-draft input[name="outcome"]', "", 400);
      await page.keyboard.press("Space");
      await tabTo(page, "#report-draft textarea");
      await page.keyboard.type("A sound design; nothing to change before filling.");
      await page.locator("#report-draft").getByText("✓ Everything needed is there.").waitFor();
      await page.getByTestId("save-report").getByText("✓ Saved").waitFor();
      await tabTo(page, "#report-draft button", "Deliver the report");
      await page.keyboard.press("Enter");
      await page.waitForURL(`**/jobs/${job.id}/report`);
    });
    await step("the pin is where the keys put it", async () => {
      const row = await knex("checklist_answers as a")
        .join("reports as r", "r.id", "a.report_id")
        .where({ "r.job_id": job.id, "a.item_key": "scald" })
        .first("a.pins");
      const pins = parseJson(row.pins) as { x: number; y: number }[];
      const scald = await knex("checklist_answers as a")
        .join("reports as r", "r.id", "a.report_id")
        .where({ "r.job_id": job.id, "a.item_key": "scald" })
        .first("a.verdict");
      expect(scald.verdict).toBe("concern");
      // From the centre: four steps of 5 % left, one of 1 % up.
      expect(pins).toEqual([expect.objectContaining({ x: 0.3, y: 0.49 })]);
      expect((await knex("jobs").where({ id: job.id }).first("state")).state).toBe("delivered");
    });
    await context.close();
  }, 180_000);
});
