"use client";

import { useState } from "react";
import { ActionForm } from "@/components/ui/action-form";
import { Button } from "@/components/ui/button";
import { acceptQuoteAction } from "./actions";

/**
 * Accepting a quote, in two steps: the button opens a confirmation with the price, the reviewer
 * and what happens next; only its own button sends the acceptance.
 */
export function AcceptButton({
  requestId,
  quoteId,
  label,
  price,
  serviceName,
}: {
  requestId: number;
  quoteId: number;
  /** The reviewer's trading name. */
  label: string;
  /** The price, formatted in its currency. */
  price: string;
  serviceName: string;
}) {
  const [confirming, setConfirming] = useState(false);
  const titleId = `accept-${quoteId}-title`;
  return (
    <>
      <Button
        type="button"
        size="compact"
        className="w-full"
        aria-label={`Accept the quote from ${label}`}
        onClick={() => setConfirming(true)}
      >
        Accept
      </Button>
      {confirming ? (
        <div
          className="fixed inset-0 z-40 flex items-end justify-center bg-slate-900/50 p-4 sm:items-center"
          onKeyDown={(e) => {
            if (e.key === "Escape") setConfirming(false);
          }}
        >
          <div
            role="dialog"
            aria-modal="true"
            aria-labelledby={titleId}
            className="w-full max-w-md space-y-3 rounded-card bg-white p-5 text-left shadow-xl"
          >
            <h2 id={titleId} className="text-xl font-bold">
              Accept {label}&apos;s quote for {price}?
            </h2>
            <p>
              {serviceName} by <strong>{label}</strong> for <strong>{price}</strong>.
            </p>
            <div>
              <p className="font-semibold">What happens next</p>
              <ol className="mt-1 list-decimal space-y-1 pl-5 text-slate-800">
                <li>The other quotes on this request are declined, and their reviewers told.</li>
                <li>
                  You pay {price} on the job page. Loopwright holds it: the reviewer is not paid
                  yet.
                </li>
                <li>
                  The reviewer starts once the payment is held and delivers the report to you.
                </li>
                <li>
                  The payment is released when you release it, or when the dispute window after
                  delivery closes.
                </li>
              </ol>
            </div>
            <div className="flex flex-wrap justify-end gap-2">
              <Button type="button" variant="secondary" onClick={() => setConfirming(false)}>
                Go back
              </Button>
              <ActionForm
                action={acceptQuoteAction}
                fields={{ requestId, quoteId }}
                submitLabel={`Accept for ${price}`}
                pendingLabel="Accepting…"
                variant="primary"
              />
            </div>
          </div>
        </div>
      ) : null}
    </>
  );
}
