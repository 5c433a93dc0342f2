import { Star } from "lucide-react";
import type { RatingSummary } from "@/lib/types/aftercare";
import { cn } from "@/lib/cn";

/** Stars drawn and said in words ("4 out of 5"), never by colour alone. */
export function Stars({ stars, className }: { stars: number; className?: string }) {
  const whole = Math.round(stars);
  return (
    <span className={cn("inline-flex items-center gap-1", className)}>
      <span aria-hidden className="inline-flex">
        {[1, 2, 3, 4, 5].map((n) => (
          <Star
            key={n}
            className={cn(
              "h-4 w-4",
              n <= whole ? "fill-sun-400 text-copper-700" : "text-slate-300",
            )}
          />
        ))}
      </span>
      <span className="font-semibold">{stars.toLocaleString("en-GB")} out of 5</span>
    </span>
  );
}

/** "4.5 out of 5 from 2 ratings", or "No ratings yet". */
export function RatingLine({ summary, className }: { summary: RatingSummary; className?: string }) {
  if (summary.average === null || summary.count === 0)
    return <span className={cn("text-slate-600", className)}>No ratings yet</span>;
  return (
    <span
      className={cn("inline-flex flex-wrap items-center gap-1", className)}
      data-rating={summary.average}
    >
      <Stars stars={summary.average} />
      <span className="text-slate-600">
        from {summary.count} {summary.count === 1 ? "rating" : "ratings"}
      </span>
    </span>
  );
}
