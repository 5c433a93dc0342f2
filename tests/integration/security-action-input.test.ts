import { readFileSync, readdirSync, existsSync } from "node:fs";
import { join } from "node:path";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { idSchema } from "@/lib/data/errors";
import { decideCredential, setSuspension } from "@/lib/data/reviewers";
import { testKnex, truncateAll } from "../support/db";
import { makeAdmin, makeReviewer } from "../support/fixtures";
import { refusalOf } from "../support/status";

/**
 * Issue 13 item 13: action arguments are parsed with zod, ids included, so NaN, Infinity and
 * objects never reach the query builder.
 */
describe("security: action arguments", () => {
  const HOSTILE = [
    Number.NaN,
    Number.POSITIVE_INFINITY,
    -1,
    0,
    1.5,
    2 ** 60,
    true,
    [5],
    { id: 5 },
    new Date(5),
    null,
    "",
    "1e3",
    "0x10",
    " 5 OR 1=1",
    "9".repeat(30),
  ];

  it("an id is a whole number or a string of digits, nothing else", () => {
    for (const v of HOSTILE) expect(idSchema.safeParse(v).success, String(v)).toBe(false);
    expect(idSchema.parse(7)).toBe(7);
    expect(idSchema.parse("42")).toBe(42);
  });

  it("every exported server action parses its arguments before doing anything", () => {
    const dir = join(process.cwd(), "components");
    const files = readdirSync(dir)
      .map((d) => join(dir, d, "actions.ts"))
      .filter((f) => existsSync(f));
    expect(files.length).toBeGreaterThan(5);
    let actions = 0;
    for (const file of files) {
      const src = readFileSync(file, "utf8");
      expect(src.startsWith('"use server"')).toBe(true);
      // Each exported function up to the next one.
      const parts = src.split(/^export async function /m).slice(1);
      for (const body of parts) {
        actions++;
        const name = body.slice(0, body.indexOf("("));
        expect(
          /\b(runAction|publicAction)\(|\.safeParse\(/.test(body),
          `${file}: ${name} must parse its input with zod (runAction or publicAction)`,
        ).toBe(true);
      }
    }
    expect(actions).toBeGreaterThan(20);
  });

  describe("against the real MariaDB", () => {
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

    it("refuses hostile ids in the data functions the admin actions call, changing nothing", async () => {
      const admin = await makeAdmin(knex);
      const reviewer = await makeReviewer(knex);
      for (const bad of [
        Number.NaN,
        Number.POSITIVE_INFINITY,
        { id: reviewer.id },
        [reviewer.id],
      ]) {
        const r = await refusalOf(
          setSuspension(knex, admin, { reviewerId: bad, suspend: true, reason: "Testing ids" }),
        );
        expect(r.status).toBe(422);
        expect(r.fieldErrors?.reviewerId).toBeDefined();
        const c = await refusalOf(
          decideCredential(
            knex,
            admin,
            { decision: "reject", credentialId: bad, reason: "Not valid" },
            "http://app.test",
          ),
        );
        expect(c.status).toBe(422);
      }
      expect(
        await knex("reviewer_profiles").where({ user_id: reviewer.id }).first("suspended_at"),
      ).toEqual({ suspended_at: null });
    });
  });
});
