import { describe, expect, it } from "vitest";
import { EnvError, parseEnv } from "@/lib/env";

describe("environment validation", () => {
  it("defaults to the local database and fakes", () => {
    const e = parseEnv({});
    expect(e.DB_HOST).toBe("127.0.0.1");
    expect(e.DB_PORT).toBe(3307);
    expect(e.CURRENCY).toBe("GBP");
  });

  it("names the bad variable", () => {
    expect(() => parseEnv({ DB_PORT: "ninety" })).toThrow(/DB_PORT/);
    expect(() => parseEnv({ APP_URL: "not a url" })).toThrow(EnvError);
  });

  it("requires the secrets in production", () => {
    expect(() => parseEnv({ APP_ENV: "production" })).toThrow(/NEXTAUTH_SECRET/);
  });
});
