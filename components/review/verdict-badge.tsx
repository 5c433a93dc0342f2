import { CircleCheck, CircleHelp, CircleMinus, OctagonX, TriangleAlert } from "lucide-react";
import { VERDICT_LABELS } from "@/lib/checklist/verdicts";
import type { Verdict } from "@/lib/types/review";
import { cn } from "@/lib/cn";

export const VERDICT_STYLE: Record<Verdict, { icon: typeof CircleCheck; className: string }> = {
  sound: { icon: CircleCheck, className: "bg-level-ok-bg text-level-ok border-level-ok" },
  concern: { icon: TriangleAlert, className: "bg-level-fix-bg text-level-fix border-level-fix" },
  unsafe: { icon: OctagonX, className: "bg-level-stop-bg text-level-stop border-level-stop" },
  not_applicable: { icon: CircleMinus, className: "bg-slate-100 text-slate-700 border-slate-400" },
  could_not_verify: {
    icon: CircleHelp,
    className: "bg-level-note-bg text-level-note border-level-note",
  },
};

/** A verdict: always an icon and words as well as a colour. */
export function VerdictBadge({
  verdict,
  className,
}: {
  verdict: Verdict | null;
  className?: string;
}) {
  if (!verdict)
    return (
      <span
        className={cn(
          "rounded-full border border-dashed border-slate-400 px-2.5 py-0.5 text-sm",
          className,
        )}
      >
        No verdict yet
      </span>
    );
  const { icon: Icon, className: tone } = VERDICT_STYLE[verdict];
  return (
    <span
      data-verdict={verdict}
      className={cn(
        "inline-flex items-center gap-1 rounded-full border px-2.5 py-0.5 text-sm font-bold",
        tone,
        className,
      )}
    >
      <Icon aria-hidden className="h-4 w-4" />
      {VERDICT_LABELS[verdict]}
    </span>
  );
}
