/**
 * Global setup for the integration project: the real MariaDB test database (already migrated by
 * `npm test`, or by hand: `npx tsx db/migrate.ts latest` with DB_TARGET=test), the payment fake
 * (the payments tests drive it through the real SDK) and the mail fake,
 * which tests/integration/mail.test.ts reaches through `inject("mailUrl")` and `inject("smtpPort")`.
 * No build and no app server.
 */
import type { TestProject } from "vitest/node";
import { acquireMailFake, acquirePaymentsFake, acquireUploadFake, TEST_PORTS } from "./fakes";

export default async function setup(project: TestProject) {
  const leaveMail = await acquireMailFake();
  const leavePayments = await acquirePaymentsFake().catch(async (e) => {
    await leaveMail();
    throw e;
  });
  const leaveUploads = await acquireUploadFake().catch(async (e) => {
    await leaveMail();
    await leavePayments();
    throw e;
  });
  project.provide("mailUrl", `http://127.0.0.1:${TEST_PORTS.mailHttp}`);
  project.provide("smtpPort", TEST_PORTS.mailSmtp);
  project.provide("paymentsUrl", `http://127.0.0.1:${TEST_PORTS.payments}`);
  project.provide("uploadUrl", `http://127.0.0.1:${TEST_PORTS.upload}`);
  return async () => {
    await leaveMail();
    await leavePayments();
    await leaveUploads();
  };
}
