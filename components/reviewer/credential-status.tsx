import { cn } from "@/lib/cn";
import { CircleCheck, Clock, OctagonX, CalendarX } from "lucide-react";
import { CREDENTIAL_STATUS_LABELS } from "@/lib/labels";

const STYLE = {
  pending: {
    icon: Clock,
    label: CREDENTIAL_STATUS_LABELS.pending,
    className: "border-level-note text-level-note bg-level-note-bg",
  },
  verified: {
    icon: CircleCheck,
    label: CREDENTIAL_STATUS_LABELS.verified,
    className: "border-level-ok text-level-ok bg-level-ok-bg",
  },
  rejected: {
    icon: OctagonX,
    label: CREDENTIAL_STATUS_LABELS.rejected,
    className: "border-level-stop text-level-stop bg-level-stop-bg",
  },
  expired: {
    icon: CalendarX,
    label: CREDENTIAL_STATUS_LABELS.expired,
    className: "border-level-fix text-level-fix bg-level-fix-bg",
  },
} as const;

export function CredentialStatus({ status }: { status: keyof typeof STYLE }) {
  const s = STYLE[status];
  return (
    <span
      data-status={status}
      className={cn(
        "inline-flex items-center gap-1 rounded-full border px-2.5 py-0.5 text-sm font-bold",
        s.className,
      )}
    >
      <s.icon aria-hidden className="h-4 w-4" /> {s.label}
    </span>
  );
}
