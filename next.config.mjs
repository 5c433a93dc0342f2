import { fileURLToPath } from "node:url";

/** @type {import('next').NextConfig} */
const nextConfig = {
  // knex loads every SQL driver lazily; bundling it makes Turbopack look for drivers we never use.
  serverExternalPackages: ["knex", "mysql2", "nodemailer", "bcryptjs", "stripe"],
  turbopack: { root: fileURLToPath(new URL(".", import.meta.url)) },
  poweredByHeader: false,
  typedRoutes: false,
  // forbidden() and unauthorized() from next/navigation render our own 403 and 401 pages.
  experimental: { authInterrupts: true },
};

export default nextConfig;
