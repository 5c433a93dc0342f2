"use client";

import { useTransition } from "react";
import { removeProject } from "./actions";

/** Deletes the project, its open request and its files, after the person confirms. */
export function DeleteProjectButton({ projectId }: { projectId: number }) {
  const [pending, start] = useTransition();
  return (
    <button
      type="button"
      disabled={pending}
      className="min-h-11 rounded-lg border border-level-stop px-4 font-semibold text-level-stop hover:bg-level-stop-bg"
      onClick={() => {
        if (
          window.confirm(
            "Delete this project, its request, sketch and photos? This cannot be undone.",
          )
        )
          start(() => removeProject(projectId));
      }}
    >
      {pending ? "Deleting…" : "Delete this project"}
    </button>
  );
}
