import { afterEach, describe, expect, it, vi } from "vitest";

/** next-auth marks its cookies Secure (and names them __Secure-…) when useSecureCookies is on. */
describe("session cookies follow the app's scheme", () => {
  const saved = { APP_URL: process.env.APP_URL, NEXTAUTH_URL: process.env.NEXTAUTH_URL };
  afterEach(() => {
    for (const [k, v] of Object.entries(saved)) {
      if (v === undefined) delete process.env[k];
      else process.env[k] = v;
    }
    vi.resetModules();
  });

  const optionsFor = async (appUrl: string) => {
    vi.resetModules();
    process.env.APP_URL = appUrl;
    delete process.env.NEXTAUTH_URL;
    const { authOptions } = await import("@/lib/server/auth/options");
    return authOptions();
  };

  it("uses Secure cookies when APP_URL is https", async () => {
    const o = await optionsFor("https://loopwright.example");
    expect(o.useSecureCookies).toBe(true);
    // next-auth's getToken (the proxy's sign-in check) picks the __Secure- cookie name from this.
    expect(process.env.NEXTAUTH_URL).toBe("https://loopwright.example");
  });

  it("uses plain cookies on the local http URL, where Secure ones would never be sent back", async () => {
    const o = await optionsFor("http://127.0.0.1:3000");
    expect(o.useSecureCookies).toBe(false);
  });
});
