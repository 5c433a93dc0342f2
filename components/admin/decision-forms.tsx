"use client";

import { useActionState, useEffect } from "react";
import { useRouter } from "next/navigation";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { decideCredentialAction, suspensionAction, type AdminFormState } from "./actions";

export function CredentialDecision({
  credentialId,
  expiresOn,
  label,
}: {
  credentialId: number;
  expiresOn: string;
  label: string;
}) {
  const [verifyState, verify, verifying] = useActionState<AdminFormState, FormData>(
    decideCredentialAction,
    { ok: false },
  );
  const [rejectState, reject, rejecting] = useActionState<AdminFormState, FormData>(
    decideCredentialAction,
    { ok: false },
  );
  const message = verifyState.message ?? rejectState.message;
  const done = verifyState.ok || rejectState.ok;
  const router = useRouter();
  // The decided row leaves the queue: say so first, then refresh the list.
  useEffect(() => {
    if (!done) return;
    const timer = setTimeout(() => router.refresh(), 2000);
    return () => clearTimeout(timer);
  }, [done, router, verifyState, rejectState]);
  if (done)
    return (
      <p role="status" className="rounded-lg bg-level-ok-bg p-3 font-semibold text-level-ok">
        {verifyState.ok ? `Verified: ${label}.` : `Rejected: ${label}.`} The reviewer is told by
        e-mail; this row leaves the queue.
      </p>
    );
  return (
    <div className="space-y-2">
      <form
        action={verify}
        className="flex flex-wrap items-end gap-2"
        aria-label={`Verify ${label}`}
      >
        <input type="hidden" name="decision" value="verify" />
        <input type="hidden" name="credentialId" value={credentialId} />
        <label className="text-sm">
          Expires
          <input
            type="date"
            name="expiresOn"
            defaultValue={expiresOn}
            className={`${inputClass} min-h-11`}
          />
        </label>
        <Button type="submit" disabled={verifying} size="compact">
          Verify
        </Button>
      </form>
      <form
        action={reject}
        className="flex flex-wrap items-end gap-2"
        aria-label={`Reject ${label}`}
      >
        <input type="hidden" name="decision" value="reject" />
        <input type="hidden" name="credentialId" value={credentialId} />
        <label className="flex-1 text-sm">
          Reason
          <input
            name="reason"
            className={`${inputClass} min-h-11`}
            aria-describedby={`reason-${credentialId}-error`}
          />
        </label>
        <Button type="submit" variant="secondary" disabled={rejecting} size="compact">
          Reject
        </Button>
      </form>
      <p id={`reason-${credentialId}-error`} aria-live="polite" className="text-sm">
        <span className={verifyState.ok || rejectState.ok ? "text-level-ok" : "text-level-stop"}>
          {rejectState.fieldErrors?.reason?.[0] ??
            verifyState.fieldErrors?.expiresOn?.[0] ??
            message ??
            ""}
        </span>
      </p>
    </div>
  );
}

export function SuspensionForm({
  reviewerId,
  suspended,
}: {
  reviewerId: number;
  suspended: boolean;
}) {
  const [state, action, pending] = useActionState<AdminFormState, FormData>(suspensionAction, {
    ok: false,
  });
  return (
    <form
      action={action}
      className="space-y-2"
      aria-label={suspended ? "Reinstate reviewer" : "Suspend reviewer"}
    >
      <input type="hidden" name="reviewerId" value={reviewerId} />
      <input type="hidden" name="suspend" value={suspended ? "0" : "1"} />
      <label className="block text-sm font-semibold">
        Reason (kept in the audit log)
        <input name="reason" className={inputClass} aria-describedby="suspension-error" />
      </label>
      <p
        id="suspension-error"
        aria-live="polite"
        className={state.ok ? "text-level-ok" : "text-sm text-level-stop"}
      >
        {state.fieldErrors?.reason?.[0] ?? state.message ?? ""}
      </p>
      <Button type="submit" variant={suspended ? "primary" : "secondary"} disabled={pending}>
        {suspended ? "Reinstate" : "Suspend"}
      </Button>
    </form>
  );
}
