"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { acceptQuoteAction, type QuoteActionState } from "./actions";

export function AcceptButton({
  requestId,
  quoteId,
  label,
}: {
  requestId: number;
  quoteId: number;
  label: string;
}) {
  const [state, action, pending] = useActionState<QuoteActionState>(
    acceptQuoteAction.bind(null, requestId, quoteId),
    { ok: false },
  );
  return (
    <form action={action}>
      <Button
        type="submit"
        disabled={pending}
        aria-label={`Accept the quote from ${label}`}
        className="min-h-11"
      >
        {pending ? "Accepting…" : "Accept"}
      </Button>
      <p
        aria-live="polite"
        className={state.ok ? "text-sm text-level-ok" : "text-sm text-level-stop"}
      >
        {state.message ?? ""}
      </p>
    </form>
  );
}
