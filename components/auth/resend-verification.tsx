"use client";

import { ActionForm } from "@/components/ui/action-form";
import { resendConfirmation } from "./actions";

export function VerifyEmailBanner() {
  return (
    <div
      role="status"
      className="flex flex-wrap items-center justify-between gap-3 rounded-card border border-level-note bg-level-note-bg p-4"
    >
      <p>Please confirm your e-mail address: we sent you a link when you signed up.</p>
      <ActionForm
        action={resendConfirmation}
        submitLabel="Send the link again"
        pendingLabel="Sending…"
        variant="secondary"
      />
    </div>
  );
}
