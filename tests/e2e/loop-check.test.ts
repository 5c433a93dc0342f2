import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { launchBrowser } from "../support/browser";

const baseUrl = inject("baseUrl");

describe("public loop-check page in Chromium", () => {
  let browser: Browser;
  let page: Page;
  beforeAll(async () => {
    browser = await launchBrowser();
    page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await page.goto(`${baseUrl}/loop-check`, { waitUntil: "networkidle" });
  });
  afterAll(async () => {
    await browser?.close();
  });

  const vesselLevel = () =>
    page.locator('[data-finding="vessel-size"] [data-level]').first().getAttribute("data-level");
  const run = () => page.getByRole("button", { name: "Run the loop check" }).click();

  it("shows the example system's findings, charts and cautions", async () => {
    await expect(page.getByTestId("loop-check-results").isVisible()).resolves.toBe(true);
    expect(await page.locator("figure").count()).toBe(2);
    expect(await page.getByText("Advisory only").count()).toBeGreaterThan(0);
  });

  it("turns the vessel finding to `fix` when the vessel is too small, and to `ok` when it is enlarged", async () => {
    const vessel = page.getByLabel("Nominal volume");
    await vessel.fill("8");
    await run();
    await page.waitForFunction(
      () =>
        document
          .querySelector('[data-finding="vessel-size"] [data-level]')
          ?.getAttribute("data-level") === "fix",
    );
    expect(await vesselLevel()).toBe("fix");
    expect(await page.locator('[data-finding="vessel-size"]').textContent()).toMatch(/too small/);

    await vessel.fill("18");
    await run();
    await page.waitForFunction(
      () =>
        document
          .querySelector('[data-finding="vessel-size"] [data-level]')
          ?.getAttribute("data-level") === "ok",
    );
    expect(await vesselLevel()).toBe("ok");
  });

  it("keeps the input and shows a field error for an impossible value", async () => {
    const relief = page.getByLabel("Relief valve setting");
    await relief.fill("60");
    await run();
    const error = page.locator("#f-pumpStation-reliefValveBar-error");
    await expect(error.textContent()).resolves.toMatch(/At most 10 bar/);
    expect(await relief.inputValue()).toBe("60");
    expect(await relief.getAttribute("aria-invalid")).toBe("true");
  });
});
