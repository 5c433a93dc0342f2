import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import type { Knex } from "knex";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { STATIC_PAGES } from "@/lib/security-headers";
import { seedDemo, DEMO_PASSWORD, DEMO_USERS } from "@/db/seeds/demo";
import { launchBrowser } from "../support/browser";
import { testKnex, truncateAll } from "../support/db";
import { signInHttp } from "../support/session";

const baseUrl = inject("baseUrl");
const uploadUrl = inject("uploadUrl");

const directives = (csp: string) =>
  Object.fromEntries(
    csp.split(";").map((d) => {
      const [name, ...values] = d.trim().split(/\s+/);
      return [name!, values];
    }),
  );

function expectCommonHeaders(res: Response, path: string) {
  expect(res.headers.get("x-content-type-options"), path).toBe("nosniff");
  expect(res.headers.get("referrer-policy"), path).toBe("strict-origin-when-cross-origin");
  const pp = res.headers.get("permissions-policy") ?? "";
  for (const f of ["camera=()", "microphone=()", "geolocation=()"]) expect(pp, path).toContain(f);
  expect(res.headers.get("x-frame-options"), path).toBe("DENY");
}

describe("security headers and the CSP, served by the built app", () => {
  let knex: Knex;
  let browser: Browser;
  let home: string;

  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    await seedDemo(knex);
    browser = await launchBrowser();
    home = (await signInHttp(baseUrl, DEMO_USERS.homeowners[0].email, DEMO_PASSWORD)).cookie;
  });
  afterAll(async () => {
    await browser?.close();
    await truncateAll(knex);
    await knex.destroy();
  });

  it("sends the common headers on pages, API answers and static files", async () => {
    const landing = await fetch(baseUrl);
    const html = await landing.text();
    const asset = html.match(/\/_next\/static\/[^"']+\.js/)?.[0];
    expect(asset).toBeTruthy();
    for (const path of ["/", "/sign-in", "/loop-check", "/api/health", "/icon.svg", asset!]) {
      const res = await fetch(`${baseUrl}${path}`);
      expect(res.status, path).toBe(200);
      expectCommonHeaders(res, path);
    }
    const page = await fetch(`${baseUrl}/dashboard`, { headers: { cookie: home } });
    expectCommonHeaders(page, "/dashboard");
    const json = await fetch(`${baseUrl}/api/files/999999`, { headers: { cookie: home } });
    expect(json.status).toBe(404);
    expectCommonHeaders(json, "/api/files/999999");
  });

  it("gives every page rendered per request a CSP with a fresh nonce that is on each of its scripts", async () => {
    const nonces: string[] = [];
    for (const [path, cookie] of [
      ["/sign-in", ""],
      ["/sign-up", ""],
      ["/no-such-page", ""],
      ["/dashboard", home],
    ] as const) {
      const res = await fetch(`${baseUrl}${path}`, { headers: cookie ? { cookie } : {} });
      expect(res.status, path).toBe(path === "/no-such-page" ? 404 : 200);
      const csp = res.headers.get("content-security-policy");
      expect(csp, path).toBeTruthy();
      const d = directives(csp!);
      expect(d["frame-ancestors"]).toEqual(["'none'"]);
      expect(d["object-src"]).toEqual(["'none'"]);
      expect(d["script-src"]).not.toContain("'unsafe-inline'");
      expect(d["connect-src"]).toEqual(["'self'", new URL(uploadUrl).origin]);
      const nonce = d["script-src"]!.find((v) => v.startsWith("'nonce-"))!.slice(7, -1);
      nonces.push(nonce);
      const html = await res.text();
      const scripts = [...html.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]);
      expect(scripts.length, path).toBeGreaterThan(0);
      for (const tag of scripts) expect(tag, path).toContain(`nonce="${nonce}"`);
    }
    expect(new Set(nonces).size).toBe(nonces.length);
  });

  it("prerenders exactly the pages that get the policy without a nonce, and serves them as built", async () => {
    // The build's own list of prerendered pages (Next.js writes it at `next build`).
    const manifest = JSON.parse(
      readFileSync(join(process.cwd(), ".next/prerender-manifest.json"), "utf8"),
    ) as { routes: Record<string, unknown> };
    const prerendered = Object.keys(manifest.routes).filter(
      (r) => !r.startsWith("/_") && !/\.(png|svg|ico|webmanifest|txt|xml)$/.test(r),
    );
    expect(new Set(prerendered)).toEqual(STATIC_PAGES);
    for (const path of STATIC_PAGES) {
      const first = await fetch(`${baseUrl}${path}`);
      expect(first.status, path).toBe(200);
      const d = directives(first.headers.get("content-security-policy")!);
      expect(d["script-src"], path).toEqual(["'self'", "'unsafe-inline'"]);
      expect(d["frame-ancestors"]).toEqual(["'none'"]);
      expect(d["object-src"]).toEqual(["'none'"]);
      const html = await first.text();
      // Built once: the same bytes for every visitor, and no nonce to go stale in a cache.
      expect(html, path).not.toContain("nonce=");
      expect(await (await fetch(`${baseUrl}${path}`)).text(), path).toBe(html);
    }
  });

  it("refuses being framed, even by a same-site page", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await page.goto(`${baseUrl}/api/health`);
    const framed = await page.evaluate(async (url) => {
      const f = document.createElement("iframe");
      f.src = url;
      document.body.append(f);
      await new Promise((r) => setTimeout(r, 1500));
      try {
        return f.contentDocument?.body?.innerText ?? null;
      } catch {
        return null;
      }
    }, `${baseUrl}/sign-in`);
    expect(framed ?? "").not.toMatch(/Sign in/);
    await context.close();
  });

  /** Every CSP report and Permissions-Policy complaint a page makes, from the console and the DOM event. */
  async function watch(context: BrowserContext) {
    const problems: string[] = [];
    await context.addInitScript(() => {
      document.addEventListener("securitypolicyviolation", (e) => {
        console.error(
          `Content Security Policy violation: ${e.violatedDirective} ${e.blockedURI} ${e.sourceFile}:${e.lineNumber}`,
        );
      });
    });
    const attach = (page: Page) => {
      page.on("console", (msg) => {
        if (/Content Security Policy|Content-Security-Policy|Permissions-Policy/i.test(msg.text()))
          problems.push(`${page.url()}: ${msg.text()}`);
      });
      page.on("pageerror", (err) => problems.push(`${page.url()}: ${err.message}`));
    };
    context.on("page", attach);
    return problems;
  }

  it("renders and runs the pages in Chromium with no CSP violation", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    context.setDefaultTimeout(15_000);
    const problems = await watch(context);
    const page = await context.newPage();

    await page.goto(baseUrl, { waitUntil: "networkidle" });
    await page.getByRole("heading", { level: 1 }).waitFor();
    // An address no page answers: the not-found page, rendered per request with the nonce.
    const missing = await page.goto(`${baseUrl}/no-such-page`, { waitUntil: "networkidle" });
    expect(missing?.status()).toBe(404);
    await page.getByRole("heading", { name: "We could not find that page" }).waitFor();

    // The loop check runs in the browser: hydration and the charts (inline SVG styles).
    await page.goto(`${baseUrl}/loop-check`, { waitUntil: "networkidle" });
    expect(await page.locator("figure").count()).toBe(2);
    await page.getByLabel("Nominal volume").fill("8");
    await page.getByRole("button", { name: "Run the loop check" }).click();
    await page.waitForFunction(
      () =>
        document
          .querySelector('[data-finding="vessel-size"] [data-level]')
          ?.getAttribute("data-level") === "fix",
    );

    // Signing in is a client-side form; a hostile callbackUrl still lands on the dashboard.
    await page.goto(`${baseUrl}/sign-in?callbackUrl=${encodeURIComponent("/\\evil.example/x")}`, {
      waitUntil: "networkidle",
    });
    await page.getByLabel("E-mail").fill(DEMO_USERS.homeowners[0].email);
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(`${baseUrl}/dashboard`);

    // A project page with the upload pickers.
    const owner = await knex("users").where({ email: DEMO_USERS.homeowners[0].email }).first("id");
    const project = await knex("projects")
      .where({ owner_id: owner.id })
      .whereNull("deleted_at")
      .first("id");
    await page.goto(`${baseUrl}/projects/${project.id}`, { waitUntil: "networkidle" });
    await page.getByRole("heading", { level: 1 }).waitFor();
    await page.goto(`${baseUrl}/projects/${project.id}/edit/site`, { waitUntil: "networkidle" });
    await page.getByLabel("Postcode area").waitFor();

    expect(problems).toEqual([]);
    await context.close();
  });

  it("keeps the sign-in redirect on this site, on the server too", async () => {
    for (const callbackUrl of [
      "/\\evil.example/x",
      "/%09/evil.example/x",
      "//evil.example",
      "https://evil.example",
    ]) {
      const csrfRes = await fetch(`${baseUrl}/api/auth/csrf`);
      const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
      const cookie = csrfRes.headers
        .getSetCookie()
        .map((c) => c.split(";")[0])
        .join("; ");
      const res = await fetch(`${baseUrl}/api/auth/callback/credentials`, {
        method: "POST",
        redirect: "manual",
        headers: { "content-type": "application/x-www-form-urlencoded", cookie },
        body: new URLSearchParams({
          csrfToken,
          email: DEMO_USERS.homeowners[1].email,
          password: DEMO_PASSWORD,
          callbackUrl,
          json: "true",
        }),
      });
      const { url } = (await res.json()) as { url: string };
      expect(new URL(url).origin, callbackUrl).toBe(baseUrl);
      expect(new URL(url).pathname.startsWith("//"), callbackUrl).toBe(false);
      expect(url, callbackUrl).not.toContain("evil.example");
    }
  });
});
