import { fileURLToPath } from "node:url";

/** @type {import('next').NextConfig} */
const nextConfig = {
  // knex loads every SQL driver lazily; bundling it makes Turbopack look for drivers we never use.
  serverExternalPackages: ["knex", "mysql2", "nodemailer", "bcryptjs"],
  turbopack: { root: fileURLToPath(new URL(".", import.meta.url)) },
  poweredByHeader: false,
  typedRoutes: false,
};

export default nextConfig;
