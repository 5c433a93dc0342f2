/**
 * Every link the product prints opens a real page: each e-mail that lib/ sends is produced
 * here by the real data-layer functions against the test database, its links are taken from
 * the rendered message and fetched from the built app as the recipient; every link on each
 * role's dashboard (the tiles included) and on the public pages is fetched the same way.
 */
import { readdirSync, readFileSync, statSync } from "node:fs";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Knex } from "knex";
import { createAccount, requestPasswordReset } from "@/lib/data/accounts";
import { postMessage } from "@/lib/data/messages";
import * as notify from "@/lib/data/notify";
import { submitQuote } from "@/lib/data/quotes";
import { renderEmail, type TemplateName } from "@/lib/mail/templates";
import { testKnex, truncateAll } from "../support/db";
import {
  FIXTURE_PASSWORD,
  makeAdmin,
  makeHomeowner,
  makeJob,
  makeProject,
  makeRequest,
  makeReviewer,
} from "../support/fixtures";
import { signInHttp } from "../support/session";

const baseUrl = inject("baseUrl");

/** The templates some code in lib/ sends (a new sender makes this test cover it or fail). */
function templatesSent(): Set<string> {
  const out = new Set<string>();
  const walk = (dir: string) => {
    for (const name of readdirSync(dir)) {
      const path = join(dir, name);
      if (statSync(path).isDirectory()) walk(path);
      else if (/\.tsx?$/.test(name))
        for (const m of readFileSync(path, "utf8").matchAll(/template: "([a-z_]+)"/g))
          out.add(m[1]!);
    }
  };
  walk("lib");
  return out;
}

const linksIn = (text: string) => [...text.matchAll(/https?:\/\/[^\s"<>)]+/g)].map((m) => m[0]);

async function fetchAs(url: string, cookie?: string) {
  const res = await fetch(url, { headers: cookie ? { cookie } : {}, redirect: "follow" });
  return { status: res.status, path: new URL(res.url).pathname };
}

describe("every link in every e-mail, tile and public page opens a real page", () => {
  let knex: Knex;
  const cookies = new Map<number, string>();
  const emails = new Map<number, string>();
  async function cookieFor(userId: number): Promise<string | undefined> {
    if (!emails.has(userId)) return undefined;
    if (!cookies.has(userId)) {
      const s = await signInHttp(baseUrl, emails.get(userId)!, FIXTURE_PASSWORD);
      cookies.set(userId, s.cookie);
    }
    return cookies.get(userId);
  }

  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  it("e-mails: each template lib/ sends is produced, and each of its links answers 200 for its recipient", async () => {
    const admin = await makeAdmin(knex);
    const owner = await makeHomeowner(knex);
    const reviewer = await makeReviewer(knex);
    for (const u of [admin, owner, reviewer]) emails.set(u.id, u.email);

    // A quote and messages both ways on an open request.
    const request = await makeRequest(knex, await makeProject(knex, owner));
    const quoteId = await submitQuote(
      knex,
      reviewer,
      request.id,
      {
        pricePounds: 90,
        turnaroundDays: 3,
        scopeMd: "Full checklist review with a written report.",
      },
      baseUrl,
    );
    await postMessage(knex, reviewer, request.id, { body: "A question about the vessel." });
    await postMessage(knex, owner, request.id, { body: "It is on the return." }, reviewer.id);
    // Jobs in the states the e-mails speak about, all for the same two people.
    const delivered = await makeJob(knex, "delivered", { homeowner: owner, reviewer, admin });
    const disputed = await makeJob(knex, "disputed", { homeowner: owner, reviewer, admin });
    const credential = await knex("credentials").where({ reviewer_id: reviewer.id }).first("id");
    await knex.transaction(async (trx) => {
      await notify.notifyQuoteAccepted(trx, baseUrl, quoteId, delivered.id);
      await notify.notifyQuoteDeclined(trx, baseUrl, quoteId);
      await notify.notifyPaymentReceived(trx, baseUrl, delivered.id);
      await notify.notifyRefundIssued(trx, baseUrl, delivered.id, 1000);
      await notify.notifyPayoutAccountReady(trx, baseUrl, reviewer.id);
      await notify.notifyReviewStarted(trx, baseUrl, delivered.id);
      await notify.notifyReportDelivered(trx, baseUrl, delivered.id, "fix_before_filling");
      await notify.notifyFundsReleased(trx, baseUrl, delivered.id);
      await notify.notifyDisputeOpened(trx, baseUrl, disputed.id, "The report missed the vessel.");
      await notify.notifyDisputeSettled(trx, baseUrl, disputed.id, "release");
      await notify.notifyCredentialVerified(trx, baseUrl, Number(credential.id));
      await trx("credentials").where({ id: credential.id }).update({ admin_reason: "Blurred." });
      await notify.notifyCredentialRejected(trx, baseUrl, Number(credential.id));
      await notify.notifyCredentialExpiring(trx, baseUrl, Number(credential.id));
    });
    // The account e-mails, opened signed out as their recipient would.
    const fresh = await createAccount(
      knex,
      {
        role: "homeowner",
        displayName: "New Person",
        email: `new-${Date.now()}@example.test`,
        password: "a long new password 2026",
      },
      baseUrl,
      "127.0.0.1",
    );
    await requestPasswordReset(knex, fresh.email, baseUrl, "127.0.0.1");

    const rows = await knex("email_outbox").select("to_user_id", "template", "payload");
    const seen = new Set(rows.map((r) => r.template as string));
    // Templates whose links are opened by the journeys that produce them, each in its own state
    // (a question on a review, a visit on a site-visit job, a receipt of a real charge, a run of
    // failed sign-ins): tests/e2e/review.test.ts, site-visit.test.ts and journey-site-visit,
    // tests/integration/payments-receipts.test.ts and security-limits.test.ts.
    const openedElsewhere = new Set([
      "item_requested",
      "visit_proposed",
      "visit_confirmed",
      "visit_declined",
      "visit_cancelled",
      "receipt",
      "sign_in_failures",
    ]);
    expect([...templatesSent()].filter((t) => !seen.has(t) && !openedElsewhere.has(t))).toEqual([]);

    const broken: string[] = [];
    let checked = 0;
    for (const row of rows) {
      const payload = typeof row.payload === "string" ? JSON.parse(row.payload) : row.payload;
      const mail = await renderEmail(row.template as TemplateName, payload);
      // The HTML's doctype names the W3C's DTD: that is not a link anyone follows.
      const html = mail.html.replace(/<!DOCTYPE[^>]*>/i, "");
      const links = new Set([...linksIn(mail.text), ...linksIn(html)]);
      expect(links.size, `${row.template} has a link`).toBeGreaterThan(0);
      for (const link of links) {
        // Functions that read APP_URL themselves (postMessage) point at the configured origin;
        // the path is what must exist, so it is fetched from the app under test.
        const url = new URL(link.replace(/&amp;/g, "&"));
        const cookie = await cookieFor(Number(row.to_user_id));
        const res = await fetchAs(`${baseUrl}${url.pathname}${url.search}`, cookie);
        checked++;
        if (res.status !== 200 || (cookie && res.path === "/sign-in"))
          broken.push(`${row.template} → ${link}: ${res.status} at ${res.path}`);
      }
    }
    expect(checked).toBeGreaterThan(15);
    expect(broken).toEqual([]);
  });

  it("tiles and dashboard links for each role, and every link on the public pages, answer 200", async () => {
    const who = [
      await makeAdmin(knex),
      await makeHomeowner(knex),
      await makeReviewer(knex),
    ] as const;
    const owner = who[1];
    await makeJob(knex, "in_review", { homeowner: owner, reviewer: who[2] });
    const broken: string[] = [];
    const visit = async (path: string, cookie?: string) => {
      const res = await fetch(`${baseUrl}${path}`, { headers: cookie ? { cookie } : {} });
      expect(res.status, path).toBe(200);
      const html = await res.text();
      const hrefs = new Set(
        [...html.matchAll(/href="(\/[^"#]*)/g)]
          .map((m) => m[1]!.replace(/&amp;/g, "&"))
          .filter((h) => !h.startsWith("/_next/")),
      );
      for (const href of hrefs) {
        const r = await fetchAs(`${baseUrl}${href}`, cookie);
        if (r.status !== 200) broken.push(`${path} → ${href}: ${r.status}`);
      }
      return hrefs;
    };
    for (const u of who) {
      const s = await signInHttp(baseUrl, u.email, FIXTURE_PASSWORD);
      const hrefs = await visit("/dashboard", s.cookie);
      if (u.role === "admin")
        for (const tile of ["/admin/credentials", "/admin/outbox", "/admin/disputes"])
          expect(hrefs.has(tile), tile).toBe(true);
    }
    for (const path of ["/", "/loop-check", "/sign-in", "/sign-up"]) await visit(path);
    expect(broken).toEqual([]);
  });
});
