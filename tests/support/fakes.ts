/**
 * Test ports and the mail and upload fakes for the global setups. The test stack uses its own
 * ports so it can run beside `npm start`; TEST_PORT_OFFSET shifts them all, so two checkouts can
 * run their suites on one machine at once.
 *
 * In a full `vitest run` the integration and e2e setups both run before the first test, in one
 * process; each fake is started once and shared (counted on globalThis), so the two setups never
 * race for a port, and it stops when the last setup that used it tears down.
 */
import { startMailFake } from "../../mocks/mail/server";
import { startUploadFake } from "../../mocks/uploads/server";
import { startPaymentsFake } from "../../mocks/payments/server";

const OFFSET = Number(process.env.TEST_PORT_OFFSET ?? 0);
export const TEST_PORTS = {
  app: Number(process.env.E2E_PORT ?? 3100 + OFFSET),
  // Each fake has a range of its own, so offsets below 100 never collide.
  mailSmtp: 2526 + OFFSET,
  mailHttp: 2626 + OFFSET,
  upload: 2726 + OFFSET,
  payments: 12112 + OFFSET,
};

/** The keys the test stack's payment fake and the app under test share. */
export const TEST_PAYMENT_KEYS = { secretKey: "sk_test_local", webhookSecret: "whsec_local" };

interface Shared {
  users: number;
  ready: Promise<{ close: () => Promise<void> }>;
}
type Registry = Record<string, Shared>;
const registry = ((globalThis as { __loopwrightTestFakes?: Registry }).__loopwrightTestFakes ??=
  {});

/** Start (or join) one shared fake; the returned function leaves it, closing it when the last one leaves. */
async function acquire(
  name: string,
  start: () => Promise<{ close: () => Promise<void> }>,
): Promise<() => Promise<void>> {
  const entry = (registry[name] ??= { users: 0, ready: start() });
  entry.users += 1;
  try {
    await entry.ready;
  } catch (e) {
    entry.users -= 1;
    if (entry.users === 0) delete registry[name];
    throw e;
  }
  let left = false;
  return async () => {
    if (left) return;
    left = true;
    entry.users -= 1;
    if (entry.users > 0) return;
    delete registry[name];
    await (await entry.ready).close();
  };
}

export function acquireMailFake() {
  return acquire("mail", () =>
    startMailFake({
      smtpPort: TEST_PORTS.mailSmtp,
      httpPort: TEST_PORTS.mailHttp,
      dir: ".data/mail-test",
    }),
  );
}

export function acquireUploadFake() {
  return acquire("uploads", () =>
    startUploadFake({ port: TEST_PORTS.upload, dir: ".data/uploads-test" }),
  );
}

/** The payment fake; its webhooks go to the app under test (tests can point them elsewhere). */
export function acquirePaymentsFake() {
  return acquire("payments", () =>
    startPaymentsFake({
      port: TEST_PORTS.payments,
      ...TEST_PAYMENT_KEYS,
      webhookUrl: `http://127.0.0.1:${TEST_PORTS.app}/api/webhooks/payments`,
      dir: ".data/payments-test",
    }),
  );
}

declare module "vitest" {
  export interface ProvidedContext {
    baseUrl: string;
    mailUrl: string;
    smtpPort: number;
    uploadUrl: string;
    paymentsUrl: string;
  }
}
