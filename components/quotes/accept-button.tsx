"use client";

import { ActionForm } from "@/components/ui/action-form";
import { acceptQuoteAction } from "./actions";

export function AcceptButton({
  requestId,
  quoteId,
  label,
}: {
  requestId: number;
  quoteId: number;
  label: string;
}) {
  return (
    <ActionForm
      action={acceptQuoteAction}
      fields={{ requestId, quoteId }}
      submitLabel="Accept"
      pendingLabel="Accepting…"
      variant="primary"
      buttonAriaLabel={`Accept the quote from ${label}`}
    />
  );
}
