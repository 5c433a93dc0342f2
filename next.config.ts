import { fileURLToPath } from "node:url";
import type { NextConfig } from "next";
import { SECURITY_HEADERS } from "./lib/security-headers";

const nextConfig: NextConfig = {
  // knex loads every SQL driver lazily; bundling it makes Turbopack look for drivers we never use.
  serverExternalPackages: ["knex", "mysql2", "nodemailer", "bcryptjs"],
  turbopack: { root: fileURLToPath(new URL(".", import.meta.url)) },
  poweredByHeader: false,
  typedRoutes: false,
  // The same on every response (pages, API, static files). The pages' Content-Security-Policy
  // needs a fresh nonce per request, so proxy.ts sets that one.
  async headers() {
    return [{ source: "/:path*", headers: [...SECURITY_HEADERS] }];
  },
};

export default nextConfig;
