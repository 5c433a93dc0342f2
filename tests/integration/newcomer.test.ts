import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { acceptQuote, declineQuote, getRequestForReviewer, submitQuote } from "@/lib/data/quotes";
import { listMessages, postMessage } from "@/lib/data/messages";
import { renderEmail } from "@/lib/mail/templates";
import { createRequest } from "@/lib/data/projects";
import { demoSystem } from "@/lib/calc/demo-system";
import { runLoopCheck } from "@/lib/calc/loop-check";
import { testKnex, truncateAll } from "../support/db";
import { makeHomeowner, makeProject, makeRequest, makeReviewer } from "../support/fixtures";

const APP = "http://app.test";
const quote = { pricePounds: 95, turnaroundDays: 3, scopeMd: "Full checklist review." };

async function declinedMail(knex: Knex, userId: number) {
  const row = await knex("email_outbox")
    .where({ to_user_id: userId, template: "quote_declined" })
    .orderBy("id", "desc")
    .first("payload");
  const payload = typeof row.payload === "string" ? JSON.parse(row.payload) : row.payload;
  return renderEmail("quote_declined", payload);
}

describe("a reviewer whose quote was not chosen, against the real MariaDB", () => {
  let knex: Knex;
  beforeAll(() => {
    knex = testKnex();
  });
  beforeEach(async () => {
    await truncateAll(knex);
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  it("still opens the request after another quote is accepted, says so, and keeps the messages readable", async () => {
    const owner = await makeHomeowner(knex);
    const chosen = await makeReviewer(knex);
    const other = await makeReviewer(knex);
    const request = await makeRequest(knex, await makeProject(knex, owner));
    const chosenQuote = await submitQuote(knex, chosen, request.id, quote, APP);
    await submitQuote(knex, other, request.id, { ...quote, pricePounds: 120 }, APP);
    await postMessage(knex, other, request.id, { body: "Is the vessel on the return?" });
    await acceptQuote(knex, owner, chosenQuote, APP);

    const seen = await getRequestForReviewer(knex, other, request.id);
    expect(seen.status).toBe("awarded");
    expect(seen.myQuote?.status).toBe("declined");
    const messages = await listMessages(knex, other, request.id);
    expect(messages.map((m) => m.bodyMd)).toEqual(["Is the vessel on the return?"]);

    const mail = await declinedMail(knex, other.id);
    expect(mail.text).toMatch(/chose another quote/);
    expect(mail.text).not.toMatch(/Their reason/);
    expect(mail.text).toContain(`${APP}/requests/${request.id}`);
  });

  it("tells a reviewer whose quote was declined with a reason that reason, not 'another quote'", async () => {
    const owner = await makeHomeowner(knex);
    const reviewer = await makeReviewer(knex);
    const request = await makeRequest(knex, await makeProject(knex, owner));
    const q = await submitQuote(knex, reviewer, request.id, quote, APP);
    await declineQuote(knex, owner, q, "Too far from the site.", APP);

    const seen = await getRequestForReviewer(knex, reviewer, request.id);
    expect(seen.myQuote).toMatchObject({
      status: "declined",
      declineReason: "Too far from the site.",
    });
    const mail = await declinedMail(knex, reviewer.id);
    expect(mail.text).toMatch(/declined your quote/);
    expect(mail.text).not.toMatch(/another quote/);
    expect(mail.text).toContain("Too far from the site.");
  });

  it("still refuses a reviewer who never quoted on a closed request", async () => {
    const owner = await makeHomeowner(knex);
    const chosen = await makeReviewer(knex);
    const stranger = await makeReviewer(knex);
    const request = await makeRequest(knex, await makeProject(knex, owner));
    await acceptQuote(knex, owner, await submitQuote(knex, chosen, request.id, quote, APP), APP);
    await expect(getRequestForReviewer(knex, stranger, request.id)).rejects.toMatchObject({
      status: 404,
    });
  });
});

describe("the safety gate on posting a request when the loop check has a stop", () => {
  let knex: Knex;
  beforeAll(() => {
    knex = testKnex();
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  const post = {
    kind: "remote_check",
    questions: "Is the relief valve right for the pump station?",
    budgetMinPounds: "60",
    budgetMaxPounds: "150",
  };

  it("refuses the post until the homeowner acknowledges, and then records that they did", async () => {
    await truncateAll(knex);
    const owner = await makeHomeowner(knex);
    // A component rated below the relief setting is a stop (tests/unit/loop-check.test.ts).
    const system = structuredClone(demoSystem);
    system.pumpStation = { ...system.pumpStation, lowestComponentMaxBar: 4 };
    expect(runLoopCheck(system).worst).toBe("stop");
    const project = await makeProject(knex, owner, { system });

    const refused = await createRequest(knex, owner, project.id, post).catch((e: unknown) => e);
    expect(refused).toMatchObject({ status: 422 });
    expect(Object.keys((refused as { fieldErrors: object }).fieldErrors)).toEqual([
      "acknowledgeStop",
    ]);
    expect(await knex("requests").where({ project_id: project.id }).count({ n: "*" })).toEqual([
      { n: 0 },
    ]);

    const id = await createRequest(knex, owner, project.id, { ...post, acknowledgeStop: "on" });
    const row = await knex("audit_log").where({ entity_id: id, action: "request.posted" }).first();
    expect(JSON.stringify(row)).toMatch(/acknowledgedStop/);
  });

  it("asks nothing extra when the loop check has no stop", async () => {
    await truncateAll(knex);
    const owner = await makeHomeowner(knex);
    const project = await makeProject(knex, owner);
    expect(runLoopCheck(project.system).worst).not.toBe("stop");
    await expect(createRequest(knex, owner, project.id, post)).resolves.toBeGreaterThan(0);
  });
});

describe("a site visit's place from the nearest town (packaged GeoNames gazetteer)", () => {
  let knex: Knex;
  beforeAll(() => {
    knex = testKnex();
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });
  const day = (n: number) => new Date(Date.now() + n * 86_400_000).toISOString().slice(0, 10);
  const visit = () => ({
    kind: "site_visit",
    questions: "Please check the vessel and the relief valve in place.",
    budgetMinPounds: "120",
    budgetMaxPounds: "300",
    windowStart: day(7),
    windowEnd: day(21),
  });

  it("derives the point from the town, and refuses a town not in the list beside its field", async () => {
    await truncateAll(knex);
    const owner = await makeHomeowner(knex);
    const project = await makeProject(knex, owner);
    // GeoNames 2649808 is Exeter, GB, at 50.7236 N, 3.52751 W (geonames.org/2649808).
    const id = await createRequest(knex, owner, project.id, { ...visit(), siteTownId: "2649808" });
    const row = await knex("requests").where({ id }).first("site_lat", "site_lng");
    expect(Number(row.site_lat)).toBeCloseTo(50.7236, 3);
    expect(Number(row.site_lng)).toBeCloseTo(-3.52751, 3);

    const other = await makeProject(knex, owner);
    const refused = await createRequest(knex, owner, other.id, {
      ...visit(),
      siteTownId: "999999999",
    }).catch((e: unknown) => e);
    expect(refused).toMatchObject({ status: 422, fieldErrors: { siteTownId: expect.any(Array) } });
  });

  it("keeps typed coordinates as the advanced option", async () => {
    await truncateAll(knex);
    const owner = await makeHomeowner(knex);
    const project = await makeProject(knex, owner);
    const id = await createRequest(knex, owner, project.id, {
      ...visit(),
      siteTownId: "2649808",
      siteLat: "51.5",
      siteLng: "-0.12",
    });
    const row = await knex("requests").where({ id }).first("site_lat", "site_lng");
    expect(Number(row.site_lat)).toBeCloseTo(51.5, 3);
  });
});
