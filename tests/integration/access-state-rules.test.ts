/**
 * The data layer's access and state rules, each stated once against the real MariaDB: who may
 * touch which row, and in which state. Every refusal is checked by its status and its message,
 * and by what stayed in the database. These are the rules a mutation run found unguarded.
 */
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { acceptQuote, declineQuote, getRequestForReviewer, submitQuote } from "@/lib/data/quotes";
import { removeProjectFile } from "@/lib/data/projects";
import { getReadableAttachment } from "@/lib/data/files";
import {
  addCredential,
  decideCredential,
  expireCredentials,
  getVerificationStatus,
} from "@/lib/data/reviewers";
import { refusalOf } from "../support/status";
import { testKnex, truncateAll } from "../support/db";
import {
  daysFromNow,
  makeAdmin,
  makeHomeowner,
  makeJob,
  makeProject,
  makeQuote,
  makeRequest,
  makeReviewer,
  sqlDateTime,
  type ProjectFixture,
} from "../support/fixtures";

const APP = "http://app.test";
const quote = { pricePounds: 95, turnaroundDays: 3, scopeMd: "Full checklist review." };
const day = (d: Date) => d.toISOString().slice(0, 10);

describe("access and state rules of the data layer", () => {
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

  async function photoOn(project: ProjectFixture, purpose = "photo") {
    const [id] = await knex("attachments").insert({
      owner_id: project.ownerId,
      project_id: project.id,
      purpose,
      file_key: `key-${project.id}-${purpose}-${Math.random().toString(36).slice(2)}`,
      file_name: "loft.jpg",
      mime_type: "image/jpeg",
      size_bytes: 1234,
    });
    return Number(id);
  }

  describe("project files", () => {
    it("only the owner removes a file: another homeowner gets 404 and the file stays", async () => {
      const owner = await makeHomeowner(knex);
      const stranger = await makeHomeowner(knex);
      const project = await makeProject(knex, owner);
      const file = await photoOn(project);
      const r = await refusalOf(removeProjectFile(knex, stranger, file));
      expect([r.status, r.message]).toEqual([404, "No such file."]);
      const row = await knex("attachments").where({ id: file }).first("deleted_at");
      expect(row.deleted_at).toBeNull();
      expect(await knex("audit_log").where({ action: "file.removed" })).toHaveLength(0);

      const key = await removeProjectFile(knex, owner, file);
      expect(key).toMatch(/^key-/);
      const removed = await knex("attachments").where({ id: file }).first("deleted_at");
      expect(removed.deleted_at).not.toBeNull();
      expect(
        await knex("audit_log").where({ action: "file.removed", entity_id: file }),
      ).toHaveLength(1);
      // Removed once: a second removal finds nothing.
      const again = await refusalOf(removeProjectFile(knex, owner, file));
      expect([again.status, again.message]).toEqual([404, "No such file."]);
    });

    it("a reviewer may not remove a homeowner's file", async () => {
      const owner = await makeHomeowner(knex);
      const project = await makeProject(knex, owner);
      const file = await photoOn(project);
      const reviewer = await makeReviewer(knex);
      const r = await refusalOf(removeProjectFile(knex, reviewer, file));
      expect(r.status).toBe(403);
      expect((await knex("attachments").where({ id: file }).first("deleted_at")).deleted_at).toBe(
        null,
      );
    });

    it("who may read a file: owner and admin always; verified reviewers while a request is open; the job's reviewer; no one else", async () => {
      const owner = await makeHomeowner(knex);
      const stranger = await makeHomeowner(knex);
      const admin = await makeAdmin(knex);
      const verified = await makeReviewer(knex);
      const unverified = await makeReviewer(knex, { verified: false });
      // Another homeowner's project, with a file and a live job of another reviewer: neither
      // that file nor that job opens anything on this project.
      const elsewhere = await makeProject(knex, stranger);
      await photoOn(elsewhere);
      await makeJob(knex, "in_review", { project: elsewhere });
      const project = await makeProject(knex, owner);
      const file = await photoOn(project);
      const read = async (actor: Parameters<typeof getReadableAttachment>[1]) => {
        try {
          return (await getReadableAttachment(knex, actor, file)).id;
        } catch (e) {
          const err = e as { status: number; message: string };
          return `${err.status} ${err.message}`;
        }
      };
      const denied = "403 You do not have access to this file.";
      // No request yet: only the owner and admins.
      expect(await read(owner)).toBe(file);
      expect(await read(admin)).toBe(file);
      expect(await getReadableAttachment(knex, owner, file)).toMatchObject({
        id: file,
        ownerId: owner.id,
        projectId: project.id,
        purpose: "photo",
        fileName: "loft.jpg",
        mimeType: "image/jpeg",
        sizeBytes: 1234,
        thumbnailKey: null,
      });
      await knex("attachments").where({ id: file }).update({ thumbnail_key: "thumb-key" });
      expect((await getReadableAttachment(knex, owner, file)).thumbnailKey).toBe("thumb-key");
      expect(await read(stranger)).toBe(denied);
      expect(await read(verified)).toBe(denied);
      // An open request: verified reviewers read it, unverified ones do not.
      const request = await makeRequest(knex, project);
      expect(await read(verified)).toBe(file);
      expect(await read(unverified)).toBe(denied);
      expect(await read(stranger)).toBe(denied);
      // Closed (cancelled, awarded, expired): reviewers without a job on it lose access.
      for (const status of ["cancelled", "awarded", "expired"]) {
        await knex("requests").where({ id: request.id }).update({ status });
        expect(await read(verified), status).toBe(denied);
      }
      // The reviewer of a live job on the project reads it; once the job is cancelled, not.
      const job = await makeJob(knex, "in_review", { project, reviewer: verified });
      expect(await read(verified)).toBe(file);
      await knex("jobs").where({ id: job.id }).update({ state: "cancelled" });
      expect(await read(verified)).toBe(denied);
      // A deleted file is gone for everyone.
      await knex("attachments")
        .where({ id: file })
        .update({ deleted_at: sqlDateTime(new Date()) });
      expect(await read(owner)).toBe("404 No such file.");
    });

    it("credential evidence is for its reviewer and admins only, never for other reviewers", async () => {
      const owner = await makeReviewer(knex);
      const other = await makeReviewer(knex);
      const admin = await makeAdmin(knex);
      const [id] = await knex("attachments").insert({
        owner_id: owner.id,
        project_id: null,
        purpose: "credential_evidence",
        file_key: "cred-key",
        file_name: "card.pdf",
        mime_type: "application/pdf",
        size_bytes: 99,
      });
      expect(await getReadableAttachment(knex, owner, Number(id))).toMatchObject({
        fileKey: "cred-key",
        projectId: null,
        purpose: "credential_evidence",
      });
      expect((await getReadableAttachment(knex, admin, Number(id))).fileKey).toBe("cred-key");
      const r = await refusalOf(getReadableAttachment(knex, other, Number(id)));
      expect([r.status, r.message]).toEqual([403, "You do not have access to this file."]);
    });
  });

  describe("requests as reviewers see them", () => {
    it("a closed request's description and photos are hidden from reviewers who did not quote", async () => {
      const owner = await makeHomeowner(knex);
      const project = await makeProject(knex, owner);
      await photoOn(project);
      const request = await makeRequest(knex, project);
      const reviewer = await makeReviewer(knex);
      const open = await getRequestForReviewer(knex, reviewer, request.id);
      expect(open.questions).toMatch(/expansion vessel/);
      expect(open.files).toHaveLength(1);
      for (const status of ["awarded", "cancelled", "expired"]) {
        await knex("requests").where({ id: request.id }).update({ status });
        const r = await refusalOf(getRequestForReviewer(knex, reviewer, request.id));
        expect([r.status, r.message], status).toEqual([404, "This request is no longer open."]);
      }
    });

    it("a reviewer whose quote was accepted still reads the awarded request", async () => {
      const job = await makeJob(knex, "in_review");
      const r = await getRequestForReviewer(knex, job.reviewer, job.request.id);
      expect(r.status).toBe("awarded");
      expect(r.myQuote?.status).toBe("accepted");
    });

    it("unverified reviewers and homeowners may not read requests", async () => {
      const owner = await makeHomeowner(knex);
      const request = await makeRequest(knex, await makeProject(knex, owner));
      const unverified = await makeReviewer(knex, { verified: false });
      const r = await refusalOf(getRequestForReviewer(knex, unverified, request.id));
      expect([r.status, r.message]).toEqual([
        403,
        "Only verified reviewers can see requests and quote.",
      ]);
      expect(
        (await refusalOf(getRequestForReviewer(knex, owner as never, request.id))).status,
      ).toBe(403);
    });
  });

  describe("quotes", () => {
    it("no quote on an awarded, cancelled or expired request: 409 and nothing written", async () => {
      const reviewer = await makeReviewer(knex);
      for (const status of ["awarded", "cancelled", "expired"] as const) {
        const owner = await makeHomeowner(knex);
        const request = await makeRequest(knex, await makeProject(knex, owner), { status });
        const r = await refusalOf(submitQuote(knex, reviewer, request.id, quote, APP));
        expect([r.status, r.message], status).toEqual([
          409,
          "This request has just closed: it no longer takes quotes.",
        ]);
      }
      expect(await knex("quotes")).toHaveLength(0);
      expect(await knex("email_outbox")).toHaveLength(0);
    });

    it("no quote once the expiry time has passed, even before the worker marks it expired", async () => {
      const reviewer = await makeReviewer(knex);
      const request = await makeRequest(knex, await makeProject(knex, await makeHomeowner(knex)));
      await knex("requests")
        .where({ id: request.id })
        .update({ expires_at: sqlDateTime(new Date(Date.now() - 1000)) });
      const r = await refusalOf(submitQuote(knex, reviewer, request.id, quote, APP));
      expect(r.status).toBe(409);
      // A minute left: it still takes quotes.
      await knex("requests")
        .where({ id: request.id })
        .update({ expires_at: sqlDateTime(new Date(Date.now() + 60_000)) });
      expect(await submitQuote(knex, reviewer, request.id, quote, APP)).toBeGreaterThan(0);
    });

    it("a price over the limit is a field error naming the limit", async () => {
      const reviewer = await makeReviewer(knex);
      const request = await makeRequest(knex, await makeProject(knex, await makeHomeowner(knex)));
      const r = await refusalOf(
        submitQuote(knex, reviewer, request.id, { ...quote, pricePounds: 99999 }, APP),
      );
      expect(r.status).toBe(422);
      expect(r.message).toBe("Some details need attention.");
      expect(r.fieldErrors?.pricePounds?.[0]).toMatch(/At most/);
      expect(await knex("quotes")).toHaveLength(0);
    });

    it("declining is for the request's owner only: another homeowner gets 404 and the quote stays live", async () => {
      const owner = await makeHomeowner(knex);
      const stranger = await makeHomeowner(knex);
      const request = await makeRequest(knex, await makeProject(knex, owner));
      const q = await makeQuote(knex, request, await makeReviewer(knex));
      const r = await refusalOf(declineQuote(knex, stranger, q.id, "not mine", APP));
      expect([r.status, r.message]).toEqual([404, "No such quote."]);
      expect((await knex("quotes").where({ id: q.id }).first("status")).status).toBe("live");
      expect(await knex("email_outbox")).toHaveLength(0);
      const rev = await refusalOf(declineQuote(knex, q.reviewer as never, q.id, "x", APP));
      expect(rev.status).toBe(403);
      await declineQuote(knex, owner, q.id, "  Too dear  ", APP);
      expect(await knex("quotes").where({ id: q.id }).first("status", "decline_reason")).toEqual({
        status: "declined",
        decline_reason: "Too dear",
      });
      expect(await knex("email_outbox").where({ template: "quote_declined" })).toHaveLength(1);
      const twice = await refusalOf(declineQuote(knex, owner, q.id, undefined, APP));
      expect([twice.status, twice.message]).toEqual([409, "Only a live quote can be declined."]);
    });

    it("no accepting once the request has expired, whether or not the worker has marked it", async () => {
      const owner = await makeHomeowner(knex);
      const request = await makeRequest(knex, await makeProject(knex, owner));
      const q = await makeQuote(knex, request, await makeReviewer(knex));
      await knex("requests")
        .where({ id: request.id })
        .update({ expires_at: sqlDateTime(new Date(Date.now() - 1000)) });
      const early = await refusalOf(acceptQuote(knex, owner, q.id, APP));
      expect([early.status, early.message]).toEqual([
        409,
        "A quote on this request has already been accepted, or the request has closed.",
      ]);
      await knex("requests").where({ id: request.id }).update({ status: "expired" });
      expect((await refusalOf(acceptQuote(knex, owner, q.id, APP))).status).toBe(409);
      expect(await knex("jobs")).toHaveLength(0);
      expect((await knex("quotes").where({ id: q.id }).first("status")).status).toBe("live");
    });

    it("no accepting on a cancelled request, nor a withdrawn quote", async () => {
      const owner = await makeHomeowner(knex);
      const request = await makeRequest(knex, await makeProject(knex, owner));
      const reviewer = await makeReviewer(knex);
      const withdrawn = await makeQuote(knex, request, reviewer, { status: "withdrawn" });
      const w = await refusalOf(acceptQuote(knex, owner, withdrawn.id, APP));
      expect([w.status, w.message]).toEqual([409, "This quote is no longer open to accept."]);
      const live = await makeQuote(knex, request, await makeReviewer(knex));
      await knex("requests").where({ id: request.id }).update({ status: "cancelled" });
      expect((await refusalOf(acceptQuote(knex, owner, live.id, APP))).status).toBe(409);
      expect(await knex("jobs")).toHaveLength(0);
    });
  });

  describe("credentials and the verified rule", () => {
    it("a credential is valid through its expiry day and expires the day after, not a day late", async () => {
      const reviewer = await makeReviewer(knex);
      const now = new Date("2031-03-10T12:00:00Z");
      const kind = "public_liability_insurance";
      const set = (on: string) =>
        knex("credentials").where({ reviewer_id: reviewer.id, kind }).update({
          expires_on: on,
          status: "verified",
        });
      await knex("credentials")
        .where({ reviewer_id: reviewer.id })
        .whereNot({ kind })
        .update({ expires_on: "2032-01-01" });
      // Expires today: still verified, and the daily pass leaves it.
      await set("2031-03-10");
      expect((await getVerificationStatus(knex, reviewer.id, now)).verified).toBe(true);
      expect(await expireCredentials(knex, now)).toBe(0);
      // Expired yesterday: not verified today, and the pass marks it expired, audited.
      await set("2031-03-09");
      expect(await getVerificationStatus(knex, reviewer.id, now)).toMatchObject({
        verified: false,
        missing: [kind],
      });
      expect(await expireCredentials(knex, now)).toBe(1);
      expect(
        (await knex("credentials").where({ reviewer_id: reviewer.id, kind }).first("status"))
          .status,
      ).toBe("expired");
      expect(await knex("audit_log").where({ action: "credential.expired" })).toHaveLength(1);
      expect(await expireCredentials(knex, now)).toBe(0);
    });

    it("a past-dated credential is refused on entry and never verified by an admin", async () => {
      const reviewer = await makeReviewer(knex, { verified: false });
      const admin = await makeAdmin(knex);
      const yesterday = day(daysFromNow(-1));
      const today = day(new Date());
      const input = { kind: "trade_registration", issuer: "Body", number: "N-1" };
      const r = await refusalOf(addCredential(knex, reviewer, { ...input, expiresOn: yesterday }));
      expect(r.status).toBe(422);
      expect(r.fieldErrors?.expiresOn).toEqual(["This credential has already expired"]);
      // Today is still valid.
      const id = await addCredential(knex, reviewer, { ...input, expiresOn: today });
      await decideCredential(
        knex,
        admin,
        { credentialId: id, decision: "verify", expiresOn: yesterday },
        APP,
      );
      expect((await knex("credentials").where({ id }).first("status")).status).toBe("expired");
      expect(await knex("email_outbox").where({ template: "credential_verified" })).toHaveLength(0);
      await decideCredential(
        knex,
        admin,
        { credentialId: id, decision: "verify", expiresOn: today },
        APP,
      );
      expect((await knex("credentials").where({ id }).first("status")).status).toBe("verified");
    });
  });
});
