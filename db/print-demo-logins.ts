/** Printed by `npm start`: where the app is and who to sign in as. */
import { DEMO_PASSWORD, DEMO_USERS } from "./seeds/demo";

const url = process.argv[2] ?? "http://127.0.0.1:3000";
const mailbox = process.env.MAIL_FAKE_URL ?? "http://127.0.0.1:2580";
const rows = [
  ["admin", DEMO_USERS.admin.email],
  ...DEMO_USERS.homeowners.map((h) => ["homeowner", h.email]),
  ...DEMO_USERS.reviewers.map((r) => [`reviewer (${r.state})`, r.email]),
];
console.log(
  `\nLoopwright is at ${url}  (loop check: ${url}/loop-check, health: ${url}/api/health)`,
);
console.log(`Demo mailbox, where every e-mail sent locally lands: ${mailbox}`);
console.log(`Demo sign-ins, all with the password "${DEMO_PASSWORD}":`);
for (const [role, email] of rows) console.log(`  ${role!.padEnd(22)} ${email}`);
console.log("");
