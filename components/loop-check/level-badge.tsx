import { CircleCheck, Info, OctagonX, Wrench } from "lucide-react";
import { LEVEL_LABELS, type Level } from "@/lib/calc/findings";
import { cn } from "@/lib/cn";

const STYLE: Record<Level, { icon: typeof Info; className: string }> = {
  ok: { icon: CircleCheck, className: "bg-level-ok-bg text-level-ok border-level-ok" },
  note: { icon: Info, className: "bg-level-note-bg text-level-note border-level-note" },
  fix: { icon: Wrench, className: "bg-level-fix-bg text-level-fix border-level-fix" },
  stop: { icon: OctagonX, className: "bg-level-stop-bg text-level-stop border-level-stop" },
};

/** A finding level: always an icon and a word as well as a colour. */
export function LevelBadge({ level, className }: { level: Level; className?: string }) {
  const { icon: Icon, className: tone } = STYLE[level];
  return (
    <span
      data-level={level}
      className={cn(
        "inline-flex items-center gap-1 rounded-full border px-2.5 py-0.5 text-sm font-bold",
        tone,
        className,
      )}
    >
      <Icon aria-hidden className="h-4 w-4" />
      {LEVEL_LABELS[level]}
    </span>
  );
}
