import {
  ArrowLeftRight,
  CircleCheck,
  CircleX,
  ClipboardList,
  CreditCard,
  FileCheck,
  Scale,
  ShieldCheck,
  Undo2,
  type LucideIcon,
} from "lucide-react";
import {
  STATE_ICONS,
  stateLabel,
  type JobState,
  type JobStateIcon,
  type ViewerRole,
} from "@/lib/jobs";

const ICONS: Record<JobStateIcon, LucideIcon> = {
  ArrowLeftRight,
  CircleCheck,
  CircleX,
  ClipboardList,
  CreditCard,
  FileCheck,
  Scale,
  ShieldCheck,
  Undo2,
};

/** A job's state as an icon and words, in the viewer's own terms; never colour alone. */
export function JobStateBadge({ state, viewer }: { state: JobState; viewer?: ViewerRole }) {
  const Icon = ICONS[STATE_ICONS[state]];
  return (
    <span
      className="inline-flex items-center gap-1.5 rounded-full border border-slate-300 bg-slate-50 px-3 py-1 text-sm font-semibold text-slate-800"
      data-job-state={state}
    >
      <Icon aria-hidden className="h-4 w-4" />
      {stateLabel(state, viewer)}
    </span>
  );
}
