import { afterAll, describe, expect, it } from "vitest";
import knexFactory from "knex";
import { getHealth } from "@/lib/data/health";
import { knexConfig } from "@/knexfile";
import { testKnex } from "../support/db";

describe("health check", () => {
  const up = testKnex();
  // Nothing listens on port 9 of loopback: a database that is down.
  const down = knexFactory({
    ...knexConfig("test"),
    connection: { ...(knexConfig("test").connection as object), port: 9 },
    acquireConnectionTimeout: 1500,
  });
  afterAll(async () => {
    await up.destroy();
    await down.destroy();
  });

  it("reports the database up", async () => {
    expect(await getHealth(up)).toEqual({ status: "ok", database: "up" });
  });

  it("reports the database down with a one-line reason, not a stack trace", async () => {
    const h = await getHealth(down);
    expect(h.database).toBe("down");
    expect(h.error).toBeTruthy();
    expect(h.error).not.toContain("\n");
  });
});
