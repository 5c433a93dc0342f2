"use client";
import { useId, useState, type KeyboardEvent } from "react";
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

/** How far one arrow key moves the crosshair (a fraction of the image); Shift moves it less. */
const STEP = 0.05;
const FINE_STEP = 0.01;
const clamp = (v: number) => Math.min(1, Math.max(0, Math.round(v * 10_000) / 10_000));

/**
 * An image of the project with numbered pins drawn at their fractions of its width and height.
 * With `onPick`, a click or tap on the image reports where (0–1 on each axis); so does the
 * keyboard: the image takes the focus, the arrow keys move a crosshair (Shift for small steps)
 * and Enter or Space drops the pin where it stands.
 */
export function PinnedImage({ fileId, alt, pins, highlight, onPick, className }: PinnedImageProps) {
  const [cross, setCross] = useState({ x: 0.5, y: 0.5 });
  const [focused, setFocused] = useState(false);
  const hintId = useId();

  const onKeyDown = (e: KeyboardEvent<HTMLDivElement>) => {
    if (!onPick) return;
    const d = e.shiftKey ? FINE_STEP : STEP;
    const moves: Record<string, [number, number]> = {
      ArrowLeft: [-d, 0],
      ArrowRight: [d, 0],
      ArrowUp: [0, -d],
      ArrowDown: [0, d],
    };
    const move = moves[e.key];
    if (move) {
      e.preventDefault();
      setCross((c) => ({ x: clamp(c.x + move[0]), y: clamp(c.y + move[1]) }));
    } else if (e.key === "Enter" || e.key === " ") {
      e.preventDefault();
      onPick(cross.x, cross.y);
    }
  };

  return (
    <figure className={cn("relative inline-block max-w-full", className)}>
      <div
        className={cn(
          // As wide as the image, so the pins' fractions are of the image, not the caption.
          "relative w-fit max-w-full rounded-lg",
          onPick && "focus:outline-none focus-visible:ring-4 focus-visible:ring-copper-700",
        )}
        tabIndex={onPick ? 0 : undefined}
        role={onPick ? "application" : undefined}
        aria-label={onPick ? `${alt}: place a pin` : undefined}
        aria-describedby={onPick ? hintId : undefined}
        data-pin-keyboard={onPick ? fileId : undefined}
        onKeyDown={onPick ? onKeyDown : undefined}
        onFocus={onPick ? () => setFocused(true) : undefined}
        onBlur={onPick ? () => setFocused(false) : undefined}
      >
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
        {onPick && focused ? (
          <span
            aria-hidden="true"
            data-crosshair={`${cross.x},${cross.y}`}
            className="pointer-events-none absolute h-8 w-8 -translate-x-1/2 -translate-y-1/2 rounded-full border-2 border-dashed border-slate-900 bg-white/40"
            style={{ left: `${cross.x * 100}%`, top: `${cross.y * 100}%` }}
          />
        ) : null}
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
      </div>
      {onPick ? (
        <figcaption id={hintId} className="mt-1 text-sm text-slate-600">
          With the keyboard: focus the image, move the crosshair with the arrow keys (Shift for
          small steps), press Enter to drop the pin. Crosshair at{" "}
          <span data-testid="crosshair-at">
            {Math.round(cross.x * 100)}% across, {Math.round(cross.y * 100)}% down
          </span>
          .
        </figcaption>
      ) : null}
    </figure>
  );
}
