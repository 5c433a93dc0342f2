import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import {
  createAccount,
  createAdminAccount,
  authenticate,
  verifyEmail,
  requestPasswordReset,
  resetPassword,
} from "@/lib/data/accounts";
import { issueToken } from "@/lib/data/tokens";
import { refusalOf } from "../support/status";
import { testKnex, truncateAll } from "../support/db";

const APP = "http://app.test";
const ADDR = "198.51.100.7";
const tokenFrom = async (knex: Knex, to: string, template: string) => {
  const row = await knex("email_outbox")
    .where({ to_address: to, template })
    .orderBy("id", "desc")
    .first("payload");
  const payload = typeof row.payload === "string" ? JSON.parse(row.payload) : row.payload;
  return new URL(payload.url).searchParams.get("token")!;
};

describe("accounts against the real MariaDB", () => {
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

  const good = {
    role: "homeowner" as const,
    displayName: "Ada Test",
    email: "Ada@Example.test",
    password: "copper-coil-lantern-9",
  };

  it("signs up, stores only a bcrypt hash, and queues the verification e-mail in the same transaction", async () => {
    const r = await createAccount(knex, good, APP, ADDR);
    expect(r).toMatchObject({ email: "ada@example.test", role: "homeowner" });
    const user = await knex("users").where({ email: "ada@example.test" }).first();
    expect(user.password_hash).toMatch(/^\$2[aby]\$/);
    expect(user.password_hash).not.toContain(good.password);
    expect(user.email_verified_at).toBeNull();
    const mail = await knex("email_outbox").where({
      to_address: "ada@example.test",
      template: "verify_email",
    });
    expect(mail).toHaveLength(1);
    const stored = await knex("auth_tokens").first("token_hash");
    expect(stored.token_hash).toMatch(/^[0-9a-f]{64}$/);
  });

  it("a sign-up that fails after its e-mail is queued leaves neither the account nor the e-mail", async () => {
    // A trigger makes the audit row, written after the e-mail is queued, fail for this address:
    // the real database refuses the last step, and the transaction must take the rest back.
    await knex.raw("DROP TRIGGER IF EXISTS fail_signup_audit");
    await knex.raw(`CREATE TRIGGER fail_signup_audit BEFORE INSERT ON audit_log FOR EACH ROW
      BEGIN
        IF NEW.action = 'user.signed_up' AND EXISTS (
          SELECT 1 FROM users WHERE id = NEW.entity_id AND email = 'doomed@example.test'
        ) THEN
          SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'audit refused for the test';
        END IF;
      END`);
    try {
      await expect(
        createAccount(knex, { ...good, email: "doomed@example.test" }, APP, ADDR),
      ).rejects.toThrow("audit refused for the test");
      expect(await knex("users").where({ email: "doomed@example.test" })).toHaveLength(0);
      expect(await knex("email_outbox").where({ to_address: "doomed@example.test" })).toHaveLength(
        0,
      );
      expect(await knex("auth_tokens")).toHaveLength(0);
      // The trigger passes every other sign-up: the account and its e-mail are both there.
      await createAccount(knex, good, APP, ADDR);
      expect(await knex("users").where({ email: "ada@example.test" })).toHaveLength(1);
      expect(await knex("email_outbox").where({ to_address: "ada@example.test" })).toHaveLength(1);
    } finally {
      await knex.raw("DROP TRIGGER IF EXISTS fail_signup_audit");
    }
  });

  it("gives field errors for a duplicate address, a short password and a common password", async () => {
    await createAccount(knex, good, APP, ADDR);
    const dup = await refusalOf(
      createAccount(knex, { ...good, email: "ada@example.test" }, APP, ADDR),
    );
    expect(dup.status).toBe(422);
    expect(dup.fieldErrors?.email?.[0]).toMatch(/already exists/);
    const short = await refusalOf(
      createAccount(knex, { ...good, email: "b@example.test", password: "short" }, APP, ADDR),
    );
    expect(short.fieldErrors?.password?.[0]).toMatch(/at least 10/);
    const common = await refusalOf(
      createAccount(knex, { ...good, email: "c@example.test", password: "password123" }, APP, ADDR),
    );
    expect(common.fieldErrors?.password?.[0]).toMatch(/common passwords/);
    expect(await knex("users").count({ n: "*" })).toEqual([{ n: 1 }]);
  });

  it("cannot sign up as an admin", async () => {
    const r = await refusalOf(createAccount(knex, { ...good, role: "admin" }, APP, ADDR));
    expect(r.status).toBe(422);
    expect(r.fieldErrors?.role).toBeTruthy();
    expect(await knex("users").count({ n: "*" })).toEqual([{ n: 0 }]);
  });

  it("makes admins only through the operator's path: confirmed, audited, with the same password rules", async () => {
    const admin = await createAdminAccount(knex, {
      email: "Ops@Example.org",
      displayName: "Ops Person",
      password: good.password,
    });
    expect(admin).toMatchObject({ role: "admin", email: "ops@example.org" });
    const row = await knex("users").where({ id: admin.id }).first("role", "email_verified_at");
    expect(row.role).toBe("admin");
    expect(row.email_verified_at).not.toBeNull();
    expect(await knex("audit_log").where({ action: "user.admin_created" })).toHaveLength(1);
    // No confirmation e-mail: the operator typed the address.
    expect(await knex("email_outbox").where({ to_user_id: admin.id })).toHaveLength(0);
    const dup = await refusalOf(
      createAdminAccount(knex, {
        email: "ops@example.org",
        displayName: "Again",
        password: good.password,
      }),
    );
    expect(dup.status).toBe(422);
    expect(dup.fieldErrors?.email?.[0]).toMatch(/already exists/);
    const weak = await refusalOf(
      createAdminAccount(knex, {
        email: "ops2@example.org",
        displayName: "Ops",
        password: "password123",
      }),
    );
    expect(weak.status).toBe(422);
    expect(weak.fieldErrors?.password).toBeTruthy();
    expect(await knex("users").where({ role: "admin" })).toHaveLength(1);
  });

  it("authenticates with the right password only, and says nothing about which part was wrong", async () => {
    await createAccount(knex, good, APP, ADDR);
    expect(await authenticate(knex, "ADA@example.test", good.password)).toMatchObject({
      email: "ada@example.test",
      role: "homeowner",
    });
    expect(await authenticate(knex, "ada@example.test", "wrong-password-123")).toBeNull();
    expect(await authenticate(knex, "nobody@example.test", good.password)).toBeNull();
  });

  it("verifies the address with a single-use token", async () => {
    await createAccount(knex, good, APP, ADDR);
    const token = await tokenFrom(knex, "ada@example.test", "verify_email");
    expect(await verifyEmail(knex, token)).toBe(true);
    expect((await knex("users").first("email_verified_at")).email_verified_at).not.toBeNull();
    expect(await verifyEmail(knex, token)).toBe(false);
  });

  it("refuses an expired token", async () => {
    await createAccount(knex, good, APP, ADDR);
    const user = await knex("users").first("id");
    const old = await issueToken(
      knex,
      user.id,
      "verify_email",
      new Date(Date.now() - 2 * 86_400_000),
    );
    expect(await verifyEmail(knex, old)).toBe(false);
  });

  it("resets a password once, without revealing whether an address is registered", async () => {
    await createAccount(knex, good, APP, ADDR);
    await requestPasswordReset(knex, "nobody@example.test", APP, ADDR);
    expect(await knex("email_outbox").where({ template: "reset_password" })).toHaveLength(0);
    await requestPasswordReset(knex, "ada@example.test", APP, ADDR);
    const token = await tokenFrom(knex, "ada@example.test", "reset_password");
    const mismatch = await refusalOf(
      resetPassword(knex, {
        token,
        password: "a-new-long-password",
        confirm: "different-one-here",
      }),
    );
    expect(mismatch.fieldErrors?.confirm).toBeTruthy();
    await resetPassword(knex, {
      token,
      password: "a-new-long-password",
      confirm: "a-new-long-password",
    });
    expect(await authenticate(knex, "ada@example.test", "a-new-long-password")).not.toBeNull();
    expect(await authenticate(knex, "ada@example.test", good.password)).toBeNull();
    const again = await refusalOf(
      resetPassword(knex, {
        token,
        password: "another-long-password",
        confirm: "another-long-password",
      }),
    );
    expect(again.status).toBe(422);
    expect(again.message).toMatch(/expired or was already used/);
    expect(await knex("audit_log").where({ action: "user.password_reset" })).toHaveLength(1);
  });
});
