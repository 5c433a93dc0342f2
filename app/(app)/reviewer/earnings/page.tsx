import type { Metadata } from "next";
import Link from "next/link";
import { getReviewerEarnings, syncPayoutAccount } from "@/lib/data/payments";
import { formatMoney } from "@/lib/money";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { Card } from "@/components/ui/card";
import { ActionForm } from "@/components/ui/action-form";
import { setUpPayoutAccount } from "@/components/jobs/actions";

export const metadata: Metadata = { title: "Earnings" };

export default async function EarningsPage() {
  const user = await pageUser("/reviewer/earnings", ["reviewer"]);
  // Coming back from the set-up page: ask the payment service rather than trust the redirect.
  const account = await syncPayoutAccount(db(), user).catch(() => ({
    accountId: null,
    ready: false,
  }));
  const earnings = await getReviewerEarnings(db(), user);
  return (
    <div className="max-w-3xl space-y-6">
      <h1 className="text-3xl font-bold">Earnings</h1>
      <Card>
        <h2 className="text-xl font-bold">Payout account</h2>
        {account.ready ? (
          <p className="mt-2 text-level-ok">
            Ready: payments for the reviews you deliver are released to it, less the platform fee.
          </p>
        ) : (
          <>
            <p className="mt-2">
              You can quote without one, but a payment can only be released to you once your payout
              account is set up with our payment service.
            </p>
            <ActionForm
              action={setUpPayoutAccount}
              submitLabel={account.accountId ? "Finish setting up" : "Set up your payout account"}
              pendingLabel="Opening…"
              variant="primary"
              className="mt-3"
            />
          </>
        )}
      </Card>
      <Card>
        <h2 className="text-xl font-bold">Held for you</h2>
        {earnings.heldForYou.length === 0 ? (
          <p className="mt-2">Nothing is held for you just now.</p>
        ) : (
          earnings.heldForYou.map((h) => (
            <p key={h.currency} className="mt-2">
              {formatMoney(h.amountMinor, h.currency)} across {h.jobs}{" "}
              {h.jobs === 1 ? "job" : "jobs"}, after the platform fee.
            </p>
          ))
        )}
      </Card>
      <Card>
        <h2 className="text-xl font-bold">Paid out</h2>
        {earnings.payouts.length === 0 ? (
          <p className="mt-2">No payouts yet.</p>
        ) : (
          <ul className="mt-2 divide-y divide-slate-100">
            {earnings.payouts.map((p) => (
              <li key={p.id} className="flex justify-between gap-4 py-2">
                <span>
                  <Link className="underline" href={`/jobs/${p.jobId}`}>
                    Job {p.jobId}
                  </Link>{" "}
                  · {p.createdAt.slice(0, 10)}
                </span>
                <span className="font-semibold tabular-nums">
                  {formatMoney(p.amountMinor, p.currency)}
                </span>
              </li>
            ))}
          </ul>
        )}
      </Card>
    </div>
  );
}
