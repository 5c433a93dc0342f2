import { describe, expect, it } from "vitest";
import type { NextConfig } from "next";
import { contentSecurityPolicy, makeNonce, STATIC_PAGES } from "@/lib/security-headers";

// next.config.mjs is plain JavaScript (the framework loads it before any TypeScript).
const configPath: string = "../../next.config.mjs";
const loadConfig = async () => ((await import(configPath)) as { default: NextConfig }).default;

const directives = (csp: string) =>
  Object.fromEntries(
    csp.split(";").map((d) => {
      const [name, ...values] = d.trim().split(/\s+/);
      return [name!, values];
    }),
  );

const base = {
  nonce: "bm9uY2UtZm9yLXRlc3Q=",
  appUrl: "http://127.0.0.1:3000",
  connectUrls: ["http://127.0.0.1:2590/some/path"],
};

describe("content security policy of pages", () => {
  it("runs scripts only from our origin with the nonce, never inline without it", () => {
    const d = directives(contentSecurityPolicy(base));
    expect(d["script-src"]).toEqual(["'self'", `'nonce-${base.nonce}'`, "'strict-dynamic'"]);
    expect(d["script-src"]).not.toContain("'unsafe-inline'");
    expect(d["script-src"]).not.toContain("'unsafe-eval'");
    expect(d["default-src"]).toEqual(["'self'"]);
    expect(d["object-src"]).toEqual(["'none'"]);
    expect(d["base-uri"]).toEqual(["'self'"]);
    expect(d["form-action"]).toEqual(["'self'"]);
  });

  it("gives a prerendered page (no nonce) inline scripts from the build, and nothing else loosened", () => {
    const d = directives(contentSecurityPolicy({ ...base, nonce: null }));
    expect(d["script-src"]).toEqual(["'self'", "'unsafe-inline'"]);
    expect(d["style-src-elem"]).toEqual(["'self'", "'unsafe-inline'"]);
    expect(d["default-src"]).toEqual(["'self'"]);
    expect(d["object-src"]).toEqual(["'none'"]);
    expect(d["frame-ancestors"]).toEqual(["'none'"]);
    expect(d["form-action"]).toEqual(["'self'"]);
    expect(Object.values(d).flat().join(" ")).not.toMatch(/nonce-|unsafe-eval/);
    // Only pages that hold nothing per request: never a signed-in page or a profile.
    expect([...STATIC_PAGES].sort()).toEqual(["/", "/forgot-password", "/loop-check"]);
  });

  it("forbids framing by anyone", () => {
    expect(directives(contentSecurityPolicy(base))["frame-ancestors"]).toEqual(["'none'"]);
  });

  it("lets the browser reach only our origin and the upload ingest (as an origin)", () => {
    expect(directives(contentSecurityPolicy(base))["connect-src"]).toEqual([
      "'self'",
      "http://127.0.0.1:2590",
    ]);
  });

  it("allows inline style attributes but not style elements without the nonce", () => {
    const d = directives(contentSecurityPolicy(base));
    expect(d["style-src-elem"]).toEqual(["'self'", `'nonce-${base.nonce}'`]);
    expect(d["style-src-attr"]).toEqual(["'unsafe-inline'"]);
  });

  it("adds eval and the websocket only for next dev, and upgrades requests only on https", () => {
    const dev = directives(contentSecurityPolicy({ ...base, dev: true }));
    expect(dev["script-src"]).toContain("'unsafe-eval'");
    expect(dev["connect-src"]).toContain("ws:");
    expect(directives(contentSecurityPolicy(base))["upgrade-insecure-requests"]).toBeUndefined();
    expect(
      directives(contentSecurityPolicy({ ...base, appUrl: "https://loopwright.example" }))[
        "upgrade-insecure-requests"
      ],
    ).toEqual([]);
  });

  it("makes a different nonce each time, of 16 random bytes", () => {
    const a = makeNonce();
    expect(Buffer.from(a, "base64")).toHaveLength(16);
    expect(makeNonce()).not.toBe(a);
  });
});

describe("headers on every response (next.config.ts)", () => {
  it("sends nosniff, a referrer policy, a permissions policy and no framing for every path", async () => {
    const rules = await (await loadConfig()).headers!();
    expect(rules).toHaveLength(1);
    expect(rules[0]!.source).toBe("/:path*");
    const h = Object.fromEntries(rules[0]!.headers.map((x) => [x.key, x.value]));
    expect(h["X-Content-Type-Options"]).toBe("nosniff");
    expect(h["Referrer-Policy"]).toBe("strict-origin-when-cross-origin");
    for (const feature of ["camera=()", "microphone=()", "geolocation=()"])
      expect(h["Permissions-Policy"]).toContain(feature);
    expect(h["X-Frame-Options"]).toBe("DENY");
  });
});
