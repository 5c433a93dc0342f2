"use client";

import { useActionState } from "react";
import { idleState } from "@/lib/types/action";
import { cn } from "@/lib/cn";
import { Button } from "@/components/ui/button";
import { rateReviewerAction, replyToRatingAction } from "./actions";

function Answer({ ok, message }: { ok: boolean; message?: string }) {
  return (
    <p
      role={ok ? "status" : "alert"}
      aria-live="polite"
      className={cn("text-sm", ok ? "text-level-ok" : "font-semibold text-level-stop")}
    >
      {message ?? ""}
    </p>
  );
}

/** The homeowner's one rating of the reviewer: 1–5 stars and a comment. */
export function RatingForm({ jobId, reviewerName }: { jobId: number; reviewerName: string }) {
  const [state, action, pending] = useActionState(rateReviewerAction, idleState);
  const v = state.values ?? {};
  const starsError = state.fieldErrors?.stars?.[0];
  const commentError = state.fieldErrors?.comment?.[0];
  return (
    <form action={action} className="space-y-3" aria-label="Rate the reviewer">
      <input type="hidden" name="jobId" value={jobId} />
      <fieldset aria-describedby="stars-error">
        <legend className="font-semibold">How was {reviewerName}&apos;s review?</legend>
        <div className="mt-1 flex flex-wrap gap-2">
          {[1, 2, 3, 4, 5].map((n) => (
            <label
              key={n}
              className="flex min-h-11 cursor-pointer items-center gap-2 rounded-lg border border-slate-300 px-3 has-[:checked]:border-copper-600 has-[:checked]:bg-copper-50"
            >
              <input
                type="radio"
                name="stars"
                value={n}
                defaultChecked={v.stars === String(n)}
                className="h-5 w-5"
              />
              {n} {n === 1 ? "star" : "stars"}
            </label>
          ))}
        </div>
        <p id="stars-error" className="text-sm font-medium text-level-stop">
          {starsError ?? ""}
        </p>
      </fieldset>
      <label className="block">
        <span className="font-semibold">Comment (shown on the reviewer&apos;s public profile)</span>
        <textarea
          name="comment"
          rows={3}
          maxLength={2000}
          defaultValue={typeof v.comment === "string" ? v.comment : ""}
          aria-invalid={commentError ? true : undefined}
          className="mt-1 w-full rounded-lg border border-slate-300 p-3"
        />
        <span className="text-sm font-medium text-level-stop">{commentError ?? ""}</span>
      </label>
      <Button type="submit" disabled={pending}>
        {pending ? "Sending…" : "Send the rating"}
      </Button>
      <p className="text-sm text-slate-600">A job is rated once; the reviewer may reply once.</p>
      <Answer ok={state.ok} message={state.fieldErrors ? undefined : state.message} />
    </form>
  );
}

/** The reviewer's one reply to the rating. */
export function ReplyForm({ jobId }: { jobId: number }) {
  const [state, action, pending] = useActionState(replyToRatingAction, idleState);
  const error = state.fieldErrors?.replyMd?.[0];
  return (
    <form action={action} className="space-y-2" aria-label="Reply to the rating">
      <input type="hidden" name="jobId" value={jobId} />
      <label className="block">
        <span className="font-semibold">Your reply (once; shown beside the rating)</span>
        <textarea
          name="replyMd"
          rows={3}
          maxLength={2000}
          defaultValue={typeof state.values?.replyMd === "string" ? state.values.replyMd : ""}
          aria-invalid={error ? true : undefined}
          className="mt-1 w-full rounded-lg border border-slate-300 p-3"
        />
        <span className="text-sm font-medium text-level-stop">{error ?? ""}</span>
      </label>
      <Button type="submit" variant="secondary" disabled={pending}>
        {pending ? "Sending…" : "Send the reply"}
      </Button>
      <Answer ok={state.ok} message={state.fieldErrors ? undefined : state.message} />
    </form>
  );
}
