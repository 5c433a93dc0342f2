import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { authenticate, endSessions, getSessionUser, resetPassword } from "@/lib/data/accounts";
import { issueToken } from "@/lib/data/tokens";
import { setSuspension } from "@/lib/data/reviewers";
import { testKnex, truncateAll } from "../support/db";
import { FIXTURE_PASSWORD, makeAdmin, makeHomeowner, makeReviewer } from "../support/fixtures";

/** Issue 13 item 8: a session's version ends it on sign-out, reset, suspension and role change. */
describe("security: session versions, against the real MariaDB", () => {
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

  /** The version a fresh sign-in puts in the token. */
  async function signIn(email: string): Promise<number> {
    const user = await authenticate(knex, email, FIXTURE_PASSWORD);
    expect(user).not.toBeNull();
    return user!.sessionVersion;
  }

  it("ends every copy of a session at sign-out, once", async () => {
    const owner = await makeHomeowner(knex);
    const copied = await signIn(owner.email);
    expect(await getSessionUser(knex, owner.id, copied)).toMatchObject({ id: owner.id });
    await endSessions(knex, owner.id, copied);
    expect(await getSessionUser(knex, owner.id, copied)).toBeNull();
    // A new sign-in works, and signing out the old cookie again does not end the new session.
    const fresh = await signIn(owner.email);
    await endSessions(knex, owner.id, copied);
    expect(await getSessionUser(knex, owner.id, fresh)).toMatchObject({ id: owner.id });
  });

  it("ends sessions when the password is reset through a link", async () => {
    const owner = await makeHomeowner(knex);
    const before = await signIn(owner.email);
    const token = await issueToken(knex, owner.id, "reset_password");
    await resetPassword(knex, {
      token,
      password: "a-brand-new-passphrase",
      confirm: "a-brand-new-passphrase",
    });
    expect(await getSessionUser(knex, owner.id, before)).toBeNull();
  });

  it("ends sessions on any change of role or password hash, whichever code makes it", async () => {
    const owner = await makeHomeowner(knex);
    const v0 = await signIn(owner.email);
    await knex("users").where({ id: owner.id }).update({ role: "reviewer" });
    expect(await getSessionUser(knex, owner.id, v0)).toBeNull();
    const v1 = v0 + 1;
    expect(await getSessionUser(knex, owner.id, v1)).toMatchObject({ role: "reviewer" });
    // Other changes keep the session.
    await knex("users").where({ id: owner.id }).update({ display_name: "Renamed" });
    expect(await getSessionUser(knex, owner.id, v1)).toMatchObject({ displayName: "Renamed" });
  });

  it("ends a reviewer's sessions when an admin suspends them", async () => {
    const reviewer = await makeReviewer(knex);
    const admin = await makeAdmin(knex);
    const before = await signIn(reviewer.email);
    await setSuspension(knex, admin, {
      reviewerId: reviewer.id,
      suspend: true,
      reason: "Insurance lapsed",
    });
    expect(await getSessionUser(knex, reviewer.id, before)).toBeNull();
  });
});
