/**
 * Site visits on a site-visit job, against the real MariaDB and the SMTP fake: the reviewer
 * proposes a time inside the homeowner's window, the homeowner confirms or asks for another,
 * and both get the calendar invitation attached; the .ics is read back from the mail fake and
 * parsed with ical.js (an independent RFC 5545 parser), and a moved visit keeps its UID with a
 * higher SEQUENCE (RFC 5546 §2.1.4: a higher sequence replaces the earlier version).
 */
import { afterAll, beforeAll, beforeEach, describe, expect, inject, it } from "vitest";
import type { Knex } from "knex";
import ICAL from "ical.js";
import { askForAnotherVisit, confirmVisit, proposeVisit } from "@/lib/data/site-visits";
import { cancelJobWithRefund, getJob, jobServices } from "@/lib/data/jobs";
import { sendBatch } from "@/lib/worker/mail";
import { wallTimeIn, zonedWallTime } from "@/lib/time";
import { testKnex, truncateAll } from "../support/db";
import { makeHomeowner, makeJob, makeReviewer } from "../support/fixtures";
import { MAIL_FROM, mailFake } from "../support/mail";
import { refusalOf } from "../support/status";
import { paymentsFakeControl } from "../support/payments";
import { TEST_PAYMENT_KEYS, TEST_PORTS } from "../support/fakes";

const APP = "http://app.test";
const TZ = "Europe/London";
const mail = mailFake();
const opts = { appUrl: APP, timeZone: TZ };

/** A wall-clock time `days` from now at hh:mm in London, as the form sends it. */
const local = (days: number, hhmm = "10:30") =>
  `${wallTimeIn(new Date(Date.now() + days * 86_400_000), TZ).slice(0, 10)}T${hhmm}`;

function parseIcs(text: string) {
  const cal = new ICAL.Component(ICAL.parse(text) as unknown[]);
  const vevent = cal.getFirstSubcomponent("vevent")!;
  const event = new ICAL.Event(vevent);
  return {
    method: String(cal.getFirstPropertyValue("method")),
    uid: event.uid,
    sequence: event.sequence,
    status: String(vevent.getFirstPropertyValue("status")),
    start: event.startDate.toJSDate(),
    end: event.endDate.toJSDate(),
    attendees: vevent
      .getAllProperties("attendee")
      .map((p) => String(p.getFirstValue()).replace(/^mailto:/i, "")),
  };
}

describe("site visits", () => {
  let knex: Knex;
  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
  });
  beforeEach(async () => {
    await knex("email_outbox").del();
    await mail.reset();
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  const send = () => sendBatch(knex, mail.transport(), MAIL_FROM, "visit-test", 50);
  async function invitationFor(address: string, subject: RegExp) {
    const m = (await mail.messages(address)).find((x) => subject.test(x.subject));
    expect(m, `an e-mail to ${address} matching ${subject}`).toBeDefined();
    const ics = m!.attachments.find((a) => a.filename.endsWith(".ics"));
    expect(ics?.contentType).toMatch(/^text\/calendar/);
    return { message: m!, ics: parseIcs(ics!.content) };
  }

  it("proposed inside the window, confirmed: both get the invitation; moving it keeps the UID with a higher SEQUENCE", async () => {
    const job = await makeJob(knex, "funded", { kind: "site_visit" });
    const at = local(5);
    const proposed = await proposeVisit(
      knex,
      job.reviewer,
      job.id,
      { at, note: "I will bring a tower." },
      opts,
    );
    expect(proposed.sequence).toBe(1);
    await send();
    const first = await invitationFor(job.homeowner.email, /Site visit proposed/);
    expect(first.ics.method).toBe("REQUEST");
    expect(first.ics.status).toBe("TENTATIVE");
    expect(first.ics.uid).toBe(`site-visit-${job.id}@app.test`);
    expect(first.ics.start.toISOString()).toBe(zonedWallTime(at, TZ).toISOString());
    // Two hours (common practice for a domestic survey; our own default).
    expect(first.ics.end.getTime() - first.ics.start.getTime()).toBe(2 * 3_600_000);
    expect(first.ics.attendees).toEqual(
      expect.arrayContaining([job.homeowner.email, job.reviewer.email]),
    );
    expect(first.message.text).toMatch(/scaffold or tower, never a ladder alone/);
    expect(first.message.links).toContain(`${APP}/jobs/${job.id}`);

    await confirmVisit(knex, job.homeowner, job.id, { sequence: 1 }, opts);
    await send();
    for (const who of [job.homeowner.email, job.reviewer.email]) {
      const c = await invitationFor(who, /Site visit confirmed/);
      expect(c.ics.status).toBe("CONFIRMED");
      expect(c.ics.uid).toBe(first.ics.uid);
      expect(c.ics.sequence).toBe(2);
    }
    const view = await getJob(knex, job.homeowner, job.id);
    expect(view.visit).toMatchObject({ state: "confirmed", sequence: 2 });
    expect(view.timeline.map((t) => t.action)).toEqual(
      expect.arrayContaining(["job.visit_proposed", "job.visit_confirmed"]),
    );

    // The reviewer moves it: same UID, higher sequence, new start, tentative again.
    await mail.reset();
    const moved = local(6, "14:00");
    await proposeVisit(knex, job.reviewer, job.id, { at: moved }, opts);
    await send();
    for (const who of [job.homeowner.email, job.reviewer.email]) {
      const m = await invitationFor(who, /Site visit proposed/);
      expect(m.ics.uid).toBe(first.ics.uid);
      expect(m.ics.sequence).toBe(3);
      expect(m.ics.start.toISOString()).toBe(zonedWallTime(moved, TZ).toISOString());
    }
    // Confirming the proposal seen before the move is refused.
    const stale = await refusalOf(confirmVisit(knex, job.homeowner, job.id, { sequence: 1 }));
    expect(stale.status).toBe(409);
    expect(stale.message).toMatch(/changed the proposal/);
  });

  it("the homeowner asks for another time: both get the cancellation, the reviewer reads the note", async () => {
    const job = await makeJob(knex, "in_review", { kind: "site_visit" });
    await proposeVisit(knex, job.reviewer, job.id, { at: local(4, "09:00") }, opts);
    await askForAnotherVisit(
      knex,
      job.homeowner,
      job.id,
      { sequence: 1, note: "Any afternoon the week after suits." },
      opts,
    );
    await send();
    const r = await invitationFor(job.reviewer.email, /Another site visit time/);
    expect(r.message.text).toContain("Any afternoon the week after suits.");
    expect(r.ics.method).toBe("CANCEL");
    expect(r.ics.status).toBe("CANCELLED");
    expect(r.ics.sequence).toBe(2);
    const h = await invitationFor(job.homeowner.email, /Another site visit time/);
    expect(h.ics.uid).toBe(r.ics.uid);
    const row = await knex("jobs").where({ id: job.id }).first("visit_state", "visit_note");
    expect(row).toEqual({
      visit_state: "declined",
      visit_note: "Any afternoon the week after suits.",
    });
  });

  it("refuses a time outside the window or in the past, and the wrong people, changing nothing", async () => {
    const job = await makeJob(knex, "funded", { kind: "site_visit" });
    const req = await knex("requests").where({ id: job.request.id }).first("window_end");
    const after = new Date(`${String(req.window_end).slice(0, 10)}T12:00:00Z`);
    const outside = await refusalOf(
      proposeVisit(
        knex,
        job.reviewer,
        job.id,
        {
          at: local(0).replace(
            /^.{10}/,
            wallTimeIn(new Date(after.getTime() + 86_400_000), TZ).slice(0, 10),
          ),
        },
        opts,
      ),
    );
    expect(outside.status).toBe(422);
    expect(outside.fieldErrors?.at?.[0]).toMatch(/inside the homeowner's window/);
    // The window starts three days out in the fixture, so yesterday is both outside and past.
    expect(
      (await refusalOf(proposeVisit(knex, job.reviewer, job.id, { at: "2020-01-01T10:00" }, opts)))
        .status,
    ).toBe(422);
    expect(
      (await refusalOf(proposeVisit(knex, job.reviewer, job.id, { at: "soon" }, opts))).fieldErrors
        ?.at,
    ).toEqual(["Pick a date and time"]);
    expect(
      (await refusalOf(proposeVisit(knex, job.homeowner, job.id, { at: local(5) }, opts))).status,
    ).toBe(403);
    const stranger = await makeReviewer(knex);
    expect(
      (await refusalOf(proposeVisit(knex, stranger, job.id, { at: local(5) }, opts))).status,
    ).toBe(404);
    const otherHome = await makeHomeowner(knex);
    expect((await refusalOf(confirmVisit(knex, otherHome, job.id, { sequence: 1 }))).status).toBe(
      404,
    );
    expect(
      (await refusalOf(confirmVisit(knex, job.homeowner, job.id, { sequence: 1 }))).status,
    ).toBe(409);
    const remote = await makeJob(knex, "funded");
    expect(
      (await refusalOf(proposeVisit(knex, remote.reviewer, remote.id, { at: local(5) }, opts)))
        .status,
    ).toBe(409);
    const unpaid = await makeJob(knex, "awaiting_payment", { kind: "site_visit" });
    expect(
      (await refusalOf(proposeVisit(knex, unpaid.reviewer, unpaid.id, { at: local(5) }, opts)))
        .status,
    ).toBe(409);
    const row = await knex("jobs").where({ id: job.id }).first("visit_at", "visit_sequence");
    expect(row).toEqual({ visit_at: null, visit_sequence: 0 });
    expect(await knex("email_outbox").count({ n: "*" }).first()).toEqual({ n: 0 });
  });

  it("cancelling the job for a refund calls a booked visit off in both calendars", async () => {
    const pay = paymentsFakeControl(inject("paymentsUrl"), TEST_PAYMENT_KEYS.secretKey);
    await pay.reset();
    await pay.config({ webhookUrl: null });
    try {
      const job = await makeJob(knex, "funded", { kind: "site_visit", priceMinor: 15_000 });
      const svc = jobServices({ pay: pay.client(), appUrl: APP });
      const pi = await svc.pay.paymentIntents.create({
        amount: 15_000,
        currency: "gbp",
        payment_method: "pm_card_visa",
        confirm: true,
      });
      await knex("jobs").where({ id: job.id }).update({ payment_intent_id: pi.id });
      await proposeVisit(knex, job.reviewer, job.id, { at: local(5) }, opts);
      await confirmVisit(knex, job.homeowner, job.id, { sequence: 1 }, opts);
      await cancelJobWithRefund(knex, job.homeowner, job.id, svc);
      await send();
      for (const who of [job.homeowner.email, job.reviewer.email]) {
        const c = await invitationFor(who, /Site visit cancelled/);
        expect(c.ics.method).toBe("CANCEL");
        expect(c.ics.status).toBe("CANCELLED");
        expect(c.ics.sequence).toBe(3);
        expect(c.ics.uid).toBe(`site-visit-${job.id}@app.test`);
      }
      expect((await knex("jobs").where({ id: job.id }).first("state")).state).toBe("refunded");
    } finally {
      await pay.config({
        webhookUrl: `http://127.0.0.1:${TEST_PORTS.app}/api/webhooks/payments`,
      });
    }
  });

  it("a London wall time becomes the right UTC moment on both sides of the clock change", () => {
    // UK clocks: GMT (UTC+0) in winter, BST (UTC+1) from the last Sunday of March
    // (The Summer Time Order 2002, from memory; matched by the IANA tz database).
    expect(zonedWallTime("2027-01-15T10:30", TZ).toISOString()).toBe("2027-01-15T10:30:00.000Z");
    expect(zonedWallTime("2027-07-15T10:30", TZ).toISOString()).toBe("2027-07-15T09:30:00.000Z");
    expect(wallTimeIn(new Date("2027-07-15T09:30:00Z"), TZ)).toBe("2027-07-15T10:30");
  });
});
