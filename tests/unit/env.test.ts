import { describe, expect, it } from "vitest";
import { EnvError, parseEnv } from "@/lib/env";
import { localUploadToken } from "@/lib/uploads/config";

/** Every production secret set, so one case can leave out or change a single one. */
const production = {
  APP_ENV: "production",
  NEXTAUTH_SECRET: "a-long-production-secret-value",
  STRIPE_SECRET_KEY: "sk_live_example",
  STRIPE_WEBHOOK_SECRET: "whsec_example",
  DB_PASSWORD: "db-password",
  UPLOADTHING_TOKEN: Buffer.from(
    JSON.stringify({ apiKey: "sk_live_uploads_example", appId: "exampleapp", regions: ["x"] }),
  ).toString("base64"),
};

describe("environment validation", () => {
  it("defaults to the local database and fakes", () => {
    const e = parseEnv({});
    expect(e.DB_HOST).toBe("127.0.0.1");
    expect(e.DB_PORT).toBe(3307);
    expect(e.CURRENCY).toBe("GBP");
    expect(e.APP_TIME_ZONE).toBe("Europe/London");
  });

  it("refuses a time zone that is not an IANA name", () => {
    expect(() => parseEnv({ APP_TIME_ZONE: "Middle/Earth" })).toThrow(/APP_TIME_ZONE/);
    expect(parseEnv({ APP_TIME_ZONE: "Europe/Dublin" }).APP_TIME_ZONE).toBe("Europe/Dublin");
  });

  it("names the bad variable", () => {
    expect(() => parseEnv({ DB_PORT: "ninety" })).toThrow(/DB_PORT/);
    expect(() => parseEnv({ APP_URL: "not a url" })).toThrow(EnvError);
  });

  it("requires the secrets in production", () => {
    expect(() => parseEnv({ APP_ENV: "production" })).toThrow(/NEXTAUTH_SECRET/);
  });

  it("starts in production with every secret set", () => {
    expect(parseEnv(production).APP_ENV).toBe("production");
  });

  it("requires the upload token in production, so callbacks are never signed with the public local key", () => {
    const { UPLOADTHING_TOKEN: _omit, ...withoutToken } = production;
    expect(() => parseEnv(withoutToken)).toThrow(/Missing .*UPLOADTHING_TOKEN/);
    expect(() => parseEnv({ ...production, UPLOADTHING_TOKEN: "" })).toThrow(/UPLOADTHING_TOKEN/);
  });

  it("refuses the local development upload token in production", () => {
    expect(() => parseEnv({ ...production, UPLOADTHING_TOKEN: localUploadToken() })).toThrow(
      /UPLOADTHING_TOKEN: the local development key is public/,
    );
  });

  it("refuses an upload token that is not the service's base64 JSON", () => {
    expect(() => parseEnv({ UPLOADTHING_TOKEN: "not-a-token" })).toThrow(/UPLOADTHING_TOKEN/);
  });

  it("lets development run on the local upload token", () => {
    expect(parseEnv({}).UPLOADTHING_TOKEN).toBeUndefined();
    expect(parseEnv({ UPLOADTHING_TOKEN: localUploadToken() }).UPLOADTHING_TOKEN).toBe(
      localUploadToken(),
    );
  });
});
