import type { NumberedPin } from "@/lib/checklist/pins";
import { cn } from "@/lib/cn";

export interface PinnedImageProps {
  fileId: number;
  alt: string;
  pins: readonly NumberedPin[];
  /** Pins of these items are drawn stronger (the item being worked on). */
  highlight?: readonly string[];
  onPick?: (x: number, y: number) => void;
  className?: string;
}

/**
 * An image of the project with numbered pins drawn at their fractions of its width and height.
 * With `onPick`, a click or tap on the image reports where (0–1 on each axis).
 */
export function PinnedImage({ fileId, alt, pins, highlight, onPick, className }: PinnedImageProps) {
  return (
    <figure className={cn("relative inline-block max-w-full", className)}>
      {/* eslint-disable-next-line @next/next/no-img-element -- a private file behind our access check */}
      <img
        src={`/api/files/${fileId}`}
        alt={alt}
        data-pin-target={onPick ? fileId : undefined}
        className={cn(
          "block max-h-[70vh] w-auto max-w-full rounded-lg",
          onPick && "cursor-crosshair",
        )}
        onClick={
          onPick
            ? (e) => {
                const box = e.currentTarget.getBoundingClientRect();
                const x = (e.clientX - box.left) / box.width;
                const y = (e.clientY - box.top) / box.height;
                onPick(Math.min(1, Math.max(0, x)), Math.min(1, Math.max(0, y)));
              }
            : undefined
        }
      />
      {pins.map((p) => (
        <span
          key={`${p.itemKey}-${p.n}`}
          data-pin={p.n}
          title={p.label}
          aria-label={`Pin ${p.n}: ${p.label}`}
          className={cn(
            "pointer-events-none absolute flex h-7 w-7 -translate-x-1/2 -translate-y-1/2 items-center justify-center rounded-full border-2 border-white text-sm font-bold text-white shadow ring-2 ring-slate-900 print:shadow-none",
            !highlight || highlight.includes(p.itemKey) ? "bg-copper-700" : "bg-slate-500",
          )}
          style={{ left: `${p.x * 100}%`, top: `${p.y * 100}%` }}
        >
          {p.n}
        </span>
      ))}
    </figure>
  );
}
