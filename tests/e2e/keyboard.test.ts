/**
 * The homeowner's project steps done with the keyboard alone: sign in, go through every step
 * with Tab and Enter, and on a refused value land on the field in error with its message tied
 * to it.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import type { Knex } from "knex";
import { SECTIONS } from "@/lib/validation/system-fields";
import { launchBrowser, openContext, step } from "../support/browser";
import { testKnex, truncateAll } from "../support/db";
import { FIXTURE_PASSWORD, makeHomeowner, makeProject } from "../support/fixtures";

const baseUrl = inject("baseUrl");

/**
 * Press Tab until the focused element matches the CSS selector (and starts with the text, when
 * one is given), or fail after `max` presses.
 */
async function tabTo(page: Page, selector: string, text = "", max = 150): Promise<void> {
  for (let i = 0; i < max; i++) {
    await page.keyboard.press("Tab");
    const ok = await page.evaluate(
      ([sel, prefix]) => {
        const el = document.activeElement;
        return !!el && el.matches(sel!) && (el.textContent ?? "").trim().startsWith(prefix!);
      },
      [selector, text],
    );
    if (ok) return;
  }
  throw new Error(`no ${selector} "${text}" reached with Tab within ${max} presses`);
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
});
