import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { REQUIRED_CREDENTIAL_KINDS } from "@/lib/credentials";
import {
  addCredential,
  decideCredential,
  getCredential,
  getVerificationStatus,
  listCredentialQueue,
  listReviewerAudit,
  queueQuerySchema,
  saveReviewerProfile,
  setSuspension,
} from "@/lib/data/reviewers";
import { testKnex, truncateAll } from "../support/db";
import { statusOf } from "../support/status";

const APP = "http://app.test";
const inYear = new Date(Date.now() + 365 * 86_400_000).toISOString().slice(0, 10);
const yesterday = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10);

const status = statusOf;

describe("reviewer verification against the real MariaDB", () => {
  let knex: Knex;
  let admin: { id: number; role: "admin" };
  let rev: { id: number; role: "reviewer" };
  let other: { id: number; role: "reviewer" };
  let owner: { id: number; role: "homeowner" };

  beforeAll(() => {
    knex = testKnex();
  });
  beforeEach(async () => {
    await truncateAll(knex);
    const mk = async (email: string, role: string) =>
      Number(
        (await knex("users").insert({ email, role, display_name: email, password_hash: "x" }))[0],
      );
    admin = { id: await mk("admin@x.test", "admin"), role: "admin" };
    rev = { id: await mk("rev@x.test", "reviewer"), role: "reviewer" };
    other = { id: await mk("other@x.test", "reviewer"), role: "reviewer" };
    owner = { id: await mk("home@x.test", "homeowner"), role: "homeowner" };
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  const profile = {
    tradingName: "Test Heat",
    bio: "Twenty years of solar thermal work.",
    yearsInTrade: 20,
    specialisms: ["flat_plate"],
    region: "wales" as const,
  };

  async function verifyAll(reviewer: { id: number; role: "reviewer" }) {
    await saveReviewerProfile(knex, reviewer, profile);
    for (const kind of REQUIRED_CREDENTIAL_KINDS) {
      const id = await addCredential(knex, reviewer, {
        kind,
        issuer: "Body",
        number: `N-${kind}`,
        expiresOn: inYear,
      });
      await decideCredential(
        knex,
        admin,
        { decision: "verify", credentialId: id, expiresOn: inYear },
        APP,
      );
    }
  }

  it("is verified only with a profile and every required kind verified and unexpired", async () => {
    expect((await getVerificationStatus(knex, rev.id)).verified).toBe(false);
    await verifyAll(rev);
    expect(await getVerificationStatus(knex, rev.id)).toMatchObject({
      verified: true,
      missing: [],
    });
    // One required kind past its date: no longer verified.
    await knex("credentials")
      .where({ reviewer_id: rev.id, kind: REQUIRED_CREDENTIAL_KINDS[0] })
      .update({ expires_on: yesterday });
    expect(await getVerificationStatus(knex, rev.id)).toMatchObject({
      verified: false,
      missing: [REQUIRED_CREDENTIAL_KINDS[0]],
    });
  });

  it("a suspended reviewer is not verified, and reinstating restores it; both are audited", async () => {
    await verifyAll(rev);
    await setSuspension(knex, admin, {
      reviewerId: rev.id,
      suspend: true,
      reason: "Complaint under review",
    });
    expect((await getVerificationStatus(knex, rev.id)).verified).toBe(false);
    await setSuspension(knex, admin, {
      reviewerId: rev.id,
      suspend: false,
      reason: "Complaint closed",
    });
    expect((await getVerificationStatus(knex, rev.id)).verified).toBe(true);
    const actions = (await listReviewerAudit(knex, admin, rev.id)).map((a) => a.action);
    expect(actions.slice(0, 2)).toEqual(["reviewer.reinstated", "reviewer.suspended"]);
    expect(actions.filter((a) => a === "credential.verified")).toHaveLength(
      REQUIRED_CREDENTIAL_KINDS.length,
    );
  });

  it("rejecting needs a reason, records it, and e-mails the reviewer", async () => {
    const id = await addCredential(knex, rev, {
      kind: "trade_registration",
      issuer: "Body",
      number: "T-1",
      expiresOn: inYear,
    });
    expect(
      await status(
        decideCredential(knex, admin, { decision: "reject", credentialId: id, reason: "" }, APP),
      ),
    ).toBe(422);
    await decideCredential(
      knex,
      admin,
      { decision: "reject", credentialId: id, reason: "Number not on the register" },
      APP,
    );
    expect(await getCredential(knex, rev, id)).toMatchObject({
      status: "rejected",
      adminReason: "Number not on the register",
    });
    expect(
      await knex("email_outbox").where({ template: "credential_rejected", to_user_id: rev.id }),
    ).toHaveLength(1);
    const audit = await knex("audit_log")
      .where({ action: "credential.rejected" })
      .first("actor_id", "detail");
    expect(audit.actor_id).toBe(admin.id);
  });

  it("checks the role and the owner on every call", async () => {
    const id = await addCredential(knex, rev, {
      kind: "trade_registration",
      issuer: "Body",
      number: "T-1",
      expiresOn: inYear,
    });
    expect(await status(getCredential(knex, rev, id))).toBe(200);
    expect(await status(getCredential(knex, admin, id))).toBe(200);
    expect(await status(getCredential(knex, other, id))).toBe(403); // another reviewer
    expect(await status(getCredential(knex, owner, id))).toBe(403); // wrong role
    expect(await status(getCredential(knex, admin, 999_999))).toBe(404);
    expect(
      await status(
        addCredential(knex, owner, {
          kind: "trade_registration",
          issuer: "B",
          number: "N1",
          expiresOn: inYear,
        }),
      ),
    ).toBe(403);
    expect(await status(saveReviewerProfile(knex, owner, profile))).toBe(403);
    expect(
      await status(
        decideCredential(
          knex,
          rev,
          { decision: "verify", credentialId: id, expiresOn: inYear },
          APP,
        ),
      ),
    ).toBe(403);
    expect(
      await status(
        setSuspension(knex, rev, { reviewerId: rev.id, suspend: false, reason: "self-service" }),
      ),
    ).toBe(403);
    expect(await status(listCredentialQueue(knex, rev, queueQuerySchema.parse({})))).toBe(403);
    expect(await status(listReviewerAudit(knex, owner, rev.id))).toBe(403);
  });

  it("refuses a credential that has already expired, with a field error", async () => {
    const s = addCredential(knex, rev, {
      kind: "trade_registration",
      issuer: "Body",
      number: "T-1",
      expiresOn: yesterday,
    });
    await expect(s).rejects.toMatchObject({
      status: 422,
      fieldErrors: { expiresOn: ["This credential has already expired"] },
    });
  });

  it("filters, sorts and paginates the verification queue", async () => {
    await saveReviewerProfile(knex, rev, profile);
    for (let i = 0; i < 25; i++) {
      const date = new Date(Date.now() + (100 + i) * 86_400_000).toISOString().slice(0, 10);
      await addCredential(knex, i % 2 ? rev : other, {
        kind: i % 5 === 0 ? "trade_registration" : "public_liability_insurance",
        issuer: "Body",
        number: `Q-${i}`,
        expiresOn: date,
      });
    }
    const page1 = await listCredentialQueue(
      knex,
      admin,
      queueQuerySchema.parse({ sort: "expires_on", dir: "desc" }),
    );
    expect(page1.total).toBe(25);
    expect(page1.rows).toHaveLength(20);
    expect(page1.rows[0]!.number).toBe("Q-24");
    const page2 = await listCredentialQueue(
      knex,
      admin,
      queueQuerySchema.parse({ sort: "expires_on", dir: "desc", page: "2" }),
    );
    expect(page2.rows.map((r) => r.number)).toEqual(["Q-4", "Q-3", "Q-2", "Q-1", "Q-0"]);
    const kind = await listCredentialQueue(
      knex,
      admin,
      queueQuerySchema.parse({ kind: "trade_registration" }),
    );
    expect(kind.total).toBe(5);
    const search = await listCredentialQueue(
      knex,
      admin,
      queueQuerySchema.parse({ q: "Test Heat" }),
    );
    expect(search.total).toBe(12); // the odd ones belong to the reviewer trading as Test Heat
    const verified = await listCredentialQueue(
      knex,
      admin,
      queueQuerySchema.parse({ status: "verified" }),
    );
    expect(verified.total).toBe(0);
  });
});
