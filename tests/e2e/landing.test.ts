import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser } from "playwright-core";
import { launchBrowser } from "../support/browser";

const baseUrl = inject("baseUrl");

describe("landing page and health, served by the built app", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("answers /api/health with the database up", async () => {
    const res = await fetch(`${baseUrl}/api/health`);
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({ status: "ok", database: "up" });
  });

  it("shows what Loopwright does for each role and the cautions, with fonts from the app itself", async () => {
    const page = await browser.newPage();
    const outside: string[] = [];
    const fonts: string[] = [];
    page.on("request", (req) => {
      const url = new URL(req.url());
      if (url.host !== new URL(baseUrl).host) outside.push(req.url());
      if (req.resourceType() === "font") fonts.push(req.url());
    });
    const res = await page.goto(baseUrl, { waitUntil: "networkidle" });
    expect(res?.status()).toBe(200);
    await expect(page.getByRole("heading", { level: 1 }).textContent()).resolves.toMatch(
      /before it is filled/,
    );
    for (const role of ["Homeowners", "Plumbers and heating engineers", "Admins"]) {
      expect(await page.getByRole("heading", { name: role }).count()).toBe(1);
    }
    const cautions = await page.locator("aside").textContent();
    expect(cautions).toMatch(/Working at height/);
    expect(cautions).toMatch(/steam/);
    expect(cautions).toMatch(/Scalding/);
    expect(cautions).toMatch(/local building codes/);
    expect(outside).toEqual([]);
    expect(fonts.length).toBeGreaterThan(0);
    const fontRes = await fetch(fonts[0]!);
    expect(fontRes.status).toBe(200);
    expect(
      await page.evaluate(
        () =>
          document.fonts.check("16px Inter") ||
          [...document.fonts].some((f) => f.status === "loaded"),
      ),
    ).toBe(true);
    await page.close();
  });
});
