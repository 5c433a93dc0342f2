"use client";

import { ActionForm } from "@/components/ui/action-form";
import { removeProject } from "./actions";

/** Deletes the project, its open request and its files, after the person confirms. */
export function DeleteProjectButton({ projectId }: { projectId: number }) {
  return (
    <ActionForm
      action={removeProject}
      fields={{ projectId }}
      submitLabel="Delete this project"
      pendingLabel="Deleting…"
      confirm="Delete this project, its request, sketch and photos? This cannot be undone."
      variant="danger"
    />
  );
}
