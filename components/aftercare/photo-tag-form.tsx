"use client";

import { useActionState } from "react";
import { idleState } from "@/lib/types/action";
import type { TaggablePhoto } from "@/lib/types/aftercare";
import { cn } from "@/lib/cn";
import { Button } from "@/components/ui/button";
import { tagPhotoAction } from "./actions";

/** Tick the checks one photo shows; saved as a whole, errors shown beside the list. */
export function PhotoTagForm({
  projectId,
  photo,
  items,
}: {
  projectId: number;
  photo: TaggablePhoto;
  items: { key: string; title: string }[];
}) {
  const [state, action, pending] = useActionState(tagPhotoAction, idleState);
  const name = photo.caption ?? photo.fileName;
  const error = state.fieldErrors?.itemKeys ?? state.fieldErrors?.attachmentId;
  return (
    <form action={action} className="space-y-2" data-photo-tags={photo.id}>
      <input type="hidden" name="projectId" value={projectId} />
      <input type="hidden" name="attachmentId" value={photo.id} />
      <fieldset>
        <legend className="text-sm font-semibold">Checks this photo shows</legend>
        <div className="mt-1 max-h-64 space-y-0.5 overflow-y-auto rounded-lg border border-slate-200 p-2">
          {items.map((i) => (
            <label key={i.key} className="flex min-h-10 items-center gap-2 text-sm">
              <input
                type="checkbox"
                name="itemKeys"
                value={i.key}
                defaultChecked={photo.itemKeys.includes(i.key)}
                className="h-5 w-5"
              />
              {i.title}
            </label>
          ))}
        </div>
      </fieldset>
      {error ? (
        <ul role="alert" className="text-sm font-semibold text-level-stop">
          {error.map((e) => (
            <li key={e}>{e}</li>
          ))}
        </ul>
      ) : null}
      <Button
        type="submit"
        variant="secondary"
        disabled={pending}
        aria-label={`Save the checks for ${name}`}
        size="small"
      >
        {pending ? "Saving…" : "Save the checks"}
      </Button>
      <p
        role={state.ok ? "status" : "alert"}
        aria-live="polite"
        className={cn("text-sm", state.ok ? "text-level-ok" : "font-semibold text-level-stop")}
      >
        {error ? "" : (state.message ?? "")}
      </p>
    </form>
  );
}
