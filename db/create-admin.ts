/**
 * Make an admin account (there is no sign-up for admins):
 *   npm run admin:create -- --email ops@example.org --name "Ops Person"
 * The password is read from ADMIN_PASSWORD, or asked for on the terminal.
 */
import { parseArgs } from "node:util";
import { createInterface } from "node:readline/promises";
import knexFactory from "knex";
import { knexConfig } from "../knexfile";
import { createAdminAccount } from "../lib/data/accounts";
import { HttpError } from "../lib/data/errors";

async function main(): Promise<void> {
  const { values } = parseArgs({
    options: { email: { type: "string" }, name: { type: "string" } },
  });
  if (!values.email || !values.name) {
    console.error('usage: npm run admin:create -- --email <address> --name "<name>"');
    process.exit(2);
  }
  let password = process.env.ADMIN_PASSWORD;
  if (!password) {
    const rl = createInterface({ input: process.stdin, output: process.stdout });
    password = await rl.question("Password for the new admin: ");
    rl.close();
  }
  const knex = knexFactory(knexConfig());
  try {
    const admin = await createAdminAccount(knex, {
      email: values.email,
      displayName: values.name,
      password,
    });
    console.log(`[admin] ${admin.email} can now sign in as an admin`);
  } catch (err) {
    if (err instanceof HttpError) {
      const fields = Object.values(err.fieldErrors ?? {}).flat();
      console.error(`[admin] ${[err.message, ...fields].join(" ")}`);
      process.exit(1);
    }
    throw err;
  } finally {
    await knex.destroy();
  }
}

main().catch((err: unknown) => {
  console.error("[admin] failed:", err instanceof Error ? err.message : err);
  process.exit(1);
});
