import { inject } from "vitest";
import type { StoredMessage } from "../../mocks/mail/server";
import { createTransport } from "@/lib/worker/mail";

export const MAIL_FROM = "Loopwright <no-reply@loopwright.test>";

export function mailFake() {
  const base = inject("mailUrl");
  return {
    base,
    transport: () =>
      createTransport({ host: "127.0.0.1", port: inject("smtpPort"), from: MAIL_FROM }),
    async messages(to?: string): Promise<StoredMessage[]> {
      const res = await fetch(`${base}/api/messages${to ? `?to=${encodeURIComponent(to)}` : ""}`);
      return (await res.json()) as StoredMessage[];
    },
    async reset() {
      await fetch(`${base}/_fake/reset`, { method: "POST" });
    },
    async faults(f: { tempFail: number }) {
      await fetch(`${base}/_fake/faults`, { method: "POST", body: JSON.stringify(f) });
    },
  };
}
