import { afterAll, beforeAll, beforeEach, describe, expect, inject, it } from "vitest";
import { spawn } from "node:child_process";
import type { Knex } from "knex";
import { seedDemo } from "@/db/seeds/demo";
import { enqueueEmail } from "@/lib/data/outbox";
import { renderEmail } from "@/lib/mail/templates";
import * as notify from "@/lib/data/notify";
import { createTransport, sendBatch } from "@/lib/worker/mail";
import { testKnex, truncateAll } from "../support/db";
import { MAIL_FROM, mailFake } from "../support/mail";

const APP = "http://app.test";
const fake = mailFake();

describe("e-mail outbox, worker and SMTP fake", () => {
  let knex: Knex;
  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    await seedDemo(knex);
  });
  beforeEach(async () => {
    await knex("email_outbox").del();
    await knex("message_reads").del();
    await fake.reset();
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  const send = (workerId = "test-worker", now?: Date) =>
    sendBatch(knex, fake.transport(), MAIL_FROM, workerId, 50, now);
  const outbox = () =>
    knex("email_outbox")
      .orderBy("id")
      .select("id", "status", "attempts", "last_error", "to_address", "template");

  async function firstQuote(status: string) {
    return knex("quotes").where({ status }).orderBy("id").first("id", "request_id", "reviewer_id");
  }
  async function jobIn(state: string) {
    return knex("jobs").where({ state }).first("id", "homeowner_id", "reviewer_id");
  }
  const emailOf = async (id: number) =>
    (await knex("users").where({ id }).first("email")).email as string;

  it("renders every template with a text and an HTML part from one definition", async () => {
    const r = await renderEmail("report_delivered", {
      name: "A",
      projectTitle: "P",
      outcome: "fix before filling",
      releaseBy: "2026-12-09",
      url: "http://x.test/r",
    });
    expect(r.subject).toBe("Report delivered: P");
    expect(r.text).toContain("http://x.test/r");
    expect(r.text).toContain("advisory");
    expect(r.html).toContain('href="http://x.test/r"');
    expect(r.html).toContain("Read the report");
    // Built with react-email: its doctype, the presentation tables mail clients lay out alike,
    // the inbox preview line, and nothing that runs.
    expect(r.html).toMatch(/^<!DOCTYPE html PUBLIC/);
    expect(r.html).toMatch(/<table[^>]*role="presentation"/);
    expect(r.html).toContain("data-skip-in-text");
    expect(r.html).not.toMatch(/<script/i);
  });

  it("sends each notification to the right person with the right link", async () => {
    const live = await firstQuote("live");
    const accepted = await firstQuote("accepted");
    const declined = await firstQuote("declined");
    const funded = await jobIn("funded");
    const delivered = await jobIn("delivered");
    const disputed = await jobIn("disputed");
    const released = await jobIn("released");
    const credential = await knex("credentials")
      .where({ status: "verified" })
      .first("id", "reviewer_id");
    const homeownerOfLive = (
      await knex("requests").where({ id: live.request_id }).first("homeowner_id")
    ).homeowner_id;
    const acceptedJob = await knex("jobs").where({ quote_id: accepted.id }).first("id");

    await knex.transaction(async (trx) => {
      await notify.notifyNewQuote(trx, APP, live.id);
      await notify.notifyQuoteAccepted(trx, APP, accepted.id, acceptedJob.id);
      await notify.notifyQuoteDeclined(trx, APP, declined.id);
      await notify.notifyPaymentReceived(trx, APP, funded.id);
      await notify.notifyReviewStarted(trx, APP, funded.id);
      await notify.notifyReportDelivered(trx, APP, delivered.id, "fix_before_filling");
      await notify.notifyFundsReleased(trx, APP, released.id);
      await notify.notifyDisputeOpened(trx, APP, disputed.id, "Report missed my question");
      await notify.notifyDisputeSettled(trx, APP, disputed.id, "partial_refund");
      await notify.notifyCredentialVerified(trx, APP, credential.id);
      await knex("credentials")
        .where({ id: credential.id })
        .update({ admin_reason: "Number not found on the register" });
      await notify.notifyCredentialRejected(trx, APP, credential.id);
    });
    // "Credential verified" waits for the batch window before it may be sent.
    const result = await send(
      "test-worker",
      new Date(Date.now() + notify.CREDENTIAL_BATCH_MS + 1000),
    );
    expect(result.failed).toBe(0);

    const expectMail = async (userId: number, subject: RegExp, link: string) => {
      const box = await fake.messages(await emailOf(userId));
      const m = box.find((x) => subject.test(x.subject));
      expect(m, `${subject} to user ${userId}`).toBeDefined();
      expect(m!.links).toContain(`${APP}${link}`);
      expect(m!.html).toContain(`${APP}${link}`);
    };
    await expectMail(homeownerOfLive, /^New quote for/, `/requests/${live.request_id}`);
    await expectMail(accepted.reviewer_id, /was accepted$/, `/jobs/${acceptedJob.id}`);
    await expectMail(declined.reviewer_id, /was not chosen$/, `/requests/${declined.request_id}`);
    await expectMail(funded.homeowner_id, /^Payment held/, `/jobs/${funded.id}`);
    await expectMail(funded.reviewer_id, /^Payment held/, `/jobs/${funded.id}`);
    await expectMail(funded.homeowner_id, /^Review started/, `/jobs/${funded.id}`);
    await expectMail(delivered.homeowner_id, /^Report delivered/, `/jobs/${delivered.id}/report`);
    await expectMail(released.reviewer_id, /^Payment released/, `/jobs/${released.id}`);
    await expectMail(disputed.reviewer_id, /^Dispute opened/, `/jobs/${disputed.id}`);
    const admin = await knex("users").where({ role: "admin" }).first("id");
    await expectMail(admin.id, /^Dispute opened/, "/admin/disputes");
    await expectMail(disputed.homeowner_id, /^Dispute settled/, `/jobs/${disputed.id}`);
    await expectMail(credential.reviewer_id, /^Credential verified/, "/reviewer/credentials");
    await expectMail(credential.reviewer_id, /^Credential rejected/, "/reviewer/credentials");
  });

  it("batches credentials verified in one sitting into one e-mail, held for the batch window", async () => {
    const reviewer = await knex("credentials")
      .groupBy("reviewer_id")
      .havingRaw("count(*) >= 3")
      .first("reviewer_id");
    const ids = (
      await knex("credentials").where({ reviewer_id: reviewer.reviewer_id }).orderBy("id").limit(3)
    ).map((c) => Number(c.id));
    for (const id of ids)
      await knex.transaction((trx) => notify.notifyCredentialVerified(trx, APP, id));
    // A repeat of the same verification adds nothing.
    await knex.transaction((trx) => notify.notifyCredentialVerified(trx, APP, ids[0]!));
    const rows = (await outbox()).filter((r) => r.template === "credential_verified");
    expect(rows).toHaveLength(1);
    expect((await send()).sent).toBe(0); // still inside the batch window
    const later = new Date(Date.now() + notify.CREDENTIAL_BATCH_MS + 1000);
    expect((await send("test-worker", later)).sent).toBe(1);
    const box = await fake.messages(await emailOf(Number(reviewer.reviewer_id)));
    const m = box.find((x) => x.subject === "3 credentials verified");
    expect(m, "one e-mail for three credentials").toBeDefined();
    expect(m!.text.match(/is verified until/g)).toHaveLength(3);
  });

  it("a repeated event queues nothing new (dedupe key)", async () => {
    const job = await jobIn("funded");
    await knex.transaction((trx) => notify.notifyPaymentReceived(trx, APP, job.id));
    await knex.transaction((trx) => notify.notifyPaymentReceived(trx, APP, job.id));
    expect((await outbox()).length).toBe(2); // homeowner and reviewer, once each
  });

  it("is written in the caller's transaction: a rolled-back change sends nothing", async () => {
    await expect(
      knex.transaction(async (trx) => {
        await enqueueEmail(trx, {
          to: { address: "someone@example.test" },
          template: "verify_email",
          payload: { name: "S", url: "http://x.test/v" },
        });
        throw new Error("the change failed");
      }),
    ).rejects.toThrow("the change failed");
    expect(await outbox()).toEqual([]);
  });

  it("respects preferences for optional kinds, never for money", async () => {
    const job = await jobIn("funded");
    await knex("users").where({ id: job.homeowner_id }).update({ notify_new_quote: false });
    try {
      const address = await emailOf(job.homeowner_id);
      const quote = await enqueueEmail(knex, {
        to: { address, userId: job.homeowner_id },
        template: "new_quote",
        payload: {
          name: "H",
          projectTitle: "P",
          reviewerName: "R",
          price: "£1",
          url: "http://x.test",
        },
      });
      expect(quote).toBe("opted_out");
      await knex.transaction((trx) => notify.notifyPaymentReceived(trx, APP, job.id));
      const rows = await outbox();
      expect(rows.map((r) => r.template)).toEqual(["payment_received", "payment_received"]);
    } finally {
      await knex("users").where({ id: job.homeowner_id }).update({ notify_new_quote: true });
    }
  });

  it("retries a temporary failure with backoff and sends it once", async () => {
    await enqueueEmail(knex, {
      to: { address: "retry@example.test" },
      template: "verify_email",
      payload: { name: "R", url: "http://x.test/v" },
    });
    await fake.faults({ tempFail: 1 });
    expect(await send()).toEqual({ sent: 0, retried: 1, failed: 0 });
    let [row] = await outbox();
    expect(row).toMatchObject({ status: "pending", attempts: 1 });
    expect(row!.last_error).toMatch(/451/);
    expect(await send()).toEqual({ sent: 0, retried: 0, failed: 0 }); // not due yet
    expect(await send("test-worker", new Date(Date.now() + 60_000))).toEqual({
      sent: 1,
      retried: 0,
      failed: 0,
    });
    [row] = await outbox();
    expect(row).toMatchObject({ status: "sent", attempts: 2 });
    expect(await fake.messages("retry@example.test")).toHaveLength(1);
  });

  it("keeps rows pending while the SMTP server is down and sends them when it is back", async () => {
    await enqueueEmail(knex, {
      to: { address: "down@example.test" },
      template: "verify_email",
      payload: { name: "D", url: "http://x.test/v" },
    });
    const dead = createTransport({ host: "127.0.0.1", port: 9, from: MAIL_FROM });
    expect(await sendBatch(knex, dead, MAIL_FROM, "w")).toEqual({ sent: 0, retried: 1, failed: 0 });
    const [row] = await outbox();
    expect(row!.status).toBe("pending");
    expect(row!.last_error).toMatch(/ECONNREFUSED/);
    expect((await send("w", new Date(Date.now() + 60_000))).sent).toBe(1);
    expect(await fake.messages("down@example.test")).toHaveLength(1);
  });

  it("marks a bad address failed with the server's reply, and keeps the row", async () => {
    await enqueueEmail(knex, {
      to: { address: "nobody@bounce.test" },
      template: "verify_email",
      payload: { name: "N", url: "http://x.test/v" },
    });
    expect(await send()).toEqual({ sent: 0, retried: 0, failed: 1 });
    const [row] = await outbox();
    expect(row!.status).toBe("failed");
    expect(row!.last_error).toMatch(/550.*mailbox does not exist/);
  });

  it("two workers claiming at the same moment send every row exactly once (20 rounds)", async () => {
    // The barrier: a third connection holds the outbox under LOCK TABLES … WRITE while both
    // workers start their claim; both wait inside MariaDB (metadata lock) until it unlocks, so
    // their SELECTs run at the same moment. Without FOR UPDATE SKIP LOCKED both then take the
    // same rows and every round sends 20 instead of 10.
    const other = testKnex();
    const locker = testKnex();
    const conn = await locker.client.acquireConnection();
    const waiting = async () =>
      Number(
        (
          await knex("information_schema.processlist")
            .where("info", "like", "%email_outbox%")
            .andWhere("state", "like", "%metadata lock%")
            .count({ n: "*" })
        )[0]!.n,
      );
    try {
      for (let round = 0; round < 20; round++) {
        for (let i = 0; i < 10; i++) {
          await enqueueEmail(knex, {
            to: { address: `bulk${round}-${i}@example.test` },
            template: "verify_email",
            payload: { name: `B${i}`, url: "http://x.test/v" },
          });
        }
        await locker.raw("LOCK TABLES email_outbox WRITE").connection(conn);
        const a = sendBatch(knex, fake.transport(), MAIL_FROM, "worker-a", 10);
        const b = sendBatch(other, fake.transport(), MAIL_FROM, "worker-b", 10);
        for (let t = 0; t < 400 && (await waiting()) < 2; t++)
          await new Promise((r) => setTimeout(r, 10));
        expect(await waiting(), `round ${round}: both workers wait at the barrier`).toBe(2);
        await locker.raw("UNLOCK TABLES").connection(conn);
        const [ra, rb] = await Promise.all([a, b]);
        expect(ra.sent + rb.sent, `round ${round}`).toBe(10);
        expect(ra.retried + rb.retried + ra.failed + rb.failed).toBe(0);
      }
    } finally {
      await locker.raw("UNLOCK TABLES").connection(conn);
      await locker.client.releaseConnection(conn);
      await locker.destroy();
      await other.destroy();
    }
    const box = await fake.messages();
    expect(box).toHaveLength(200);
    expect(new Set(box.map((m) => m.messageId)).size).toBe(200);
    expect(await knex("email_outbox").whereNot({ status: "sent" })).toHaveLength(0);
  }, 180_000);

  it("a worker killed mid-batch loses nothing; on restart the rest goes, at most the one in flight twice", async () => {
    for (let i = 0; i < 60; i++) {
      await enqueueEmail(knex, {
        to: { address: `kill${i}@example.test` },
        template: "verify_email",
        payload: { name: `K${i}`, url: "http://x.test/v" },
      });
    }
    const worker = spawn(process.execPath, ["--import", "tsx", "lib/worker/main.ts"], {
      env: { ...process.env, DB_TARGET: "test", SMTP_PORT: String(inject("smtpPort")) },
      stdio: "ignore",
    });
    // Wait until it has sent some, then kill it without warning.
    for (let i = 0; i < 200 && (await fake.messages()).length < 5; i++)
      await new Promise((r) => setTimeout(r, 50));
    worker.kill("SIGKILL");
    await new Promise((r) => worker.once("exit", r));
    const sentBefore = (await fake.messages()).length;
    expect(sentBefore).toBeGreaterThanOrEqual(5);
    // A restarted worker takes the pending rows now and the dead worker's claimed rows once the claim times out.
    while (
      (await knex("email_outbox").whereNot({ status: "sent" }).count({ n: "*" }))[0]!.n !== 0
    ) {
      await send("restarted", new Date(Date.now() + 3 * 60_000));
    }
    const box = await fake.messages();
    const perId = new Map<string, number>();
    for (const m of box) perId.set(m.messageId!, (perId.get(m.messageId!) ?? 0) + 1);
    expect(perId.size).toBe(60); // nothing lost
    expect([...perId.values()].filter((n) => n > 1).length).toBeLessThanOrEqual(1);
  });

  it("batches new-message e-mails: at most one per thread and recipient every 15 minutes", async () => {
    const request = await knex("requests").where({ status: "open" }).first("id", "homeowner_id");
    // A reviewer with no thread on this request yet (the demo's quotes opened some).
    const reviewer = await knex("users")
      .where({ role: "reviewer" })
      .whereNotIn(
        "id",
        knex("message_threads").where({ request_id: request.id }).select("reviewer_id"),
      )
      .first("id");
    const [threadId] = await knex("message_threads").insert({
      request_id: request.id,
      reviewer_id: reviewer.id,
    });
    const post = async (at: Date) => {
      const [id] = await knex("messages").insert({
        thread_id: threadId,
        sender_id: reviewer.id,
        body_md: `Question at ${at.toISOString()}`,
      });
      return knex.transaction((trx) => notify.notifyNewMessage(trx, APP, Number(id), at));
    };
    const t0 = new Date();
    expect(await post(t0)).toBe("queued");
    expect(await post(new Date(t0.getTime() + 5 * 60_000))).toBe("batched");
    expect(await post(new Date(t0.getTime() + 16 * 60_000))).toBe("queued");
    const rows = await outbox();
    expect(rows.map((r) => r.to_address)).toEqual([
      await emailOf(request.homeowner_id),
      await emailOf(request.homeowner_id),
    ]);
  });
});
