import { labelFor, OUTBOX_STATUS_LABELS } from "@/lib/labels";
import type { Metadata } from "next";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { Card } from "@/components/ui/card";
import { listUnsentEmails } from "@/lib/data/outbox";

export const metadata: Metadata = { title: "E-mail outbox" };

export default async function OutboxPage() {
  const user = await pageUser("/admin/outbox", ["admin"]);
  const rows = await listUnsentEmails(db(), user);
  return (
    <div className="space-y-4">
      <h1 className="text-3xl font-bold">E-mail outbox</h1>
      <p className="text-slate-700">
        E-mails not yet sent, and those that failed for good (kept here, never dropped).
      </p>
      <Card>
        {rows.length === 0 ? (
          <p>Everything has been sent.</p>
        ) : (
          <table className="w-full text-left text-sm">
            <thead>
              <tr className="border-b border-slate-200 text-slate-600">
                <th className="py-1">Queued</th>
                <th>To</th>
                <th>Kind</th>
                <th>Status</th>
                <th>Tries</th>
                <th>Server&apos;s reply</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.id} className="border-b border-slate-100 align-top">
                  <td className="py-1 pr-2">{r.createdAt.slice(0, 16)}</td>
                  <td className="pr-2">{r.toAddress}</td>
                  <td className="pr-2">{r.template}</td>
                  <td className="pr-2 font-semibold">{labelFor(OUTBOX_STATUS_LABELS, r.status)}</td>
                  <td className="pr-2">{r.attempts}</td>
                  <td className="font-mono text-xs">{r.lastError ?? ""}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </Card>
    </div>
  );
}
