import Link from "next/link";
import { Info } from "lucide-react";

/**
 * For a reviewer whose payout account is not ready: they may quote, but a payment can only be
 * released to them once it is. Shown before acceptance, beside the quote form and on the board.
 */
export function PayoutNotice({ ready }: { ready: boolean }) {
  if (ready) return null;
  return (
    <p
      className="flex gap-2 rounded-lg bg-level-note-bg p-3 text-sm"
      role="note"
      data-testid="payout-notice"
    >
      <Info aria-hidden className="mt-0.5 h-5 w-5 shrink-0 text-copper-700" />
      <span>
        You can quote now, but a payment can only be released to you once your payout account is set
        up.{" "}
        <Link className="font-semibold text-copper-700 underline" href="/reviewer/earnings">
          Set up your payout account
        </Link>
      </span>
    </p>
  );
}
