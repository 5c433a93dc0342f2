"use client";

import { useActionState } from "react";
import { useFocusFirstError } from "@/components/ui/use-focus-first-error";
import { Button } from "@/components/ui/button";
import { FormField } from "@/components/ui/form-field";
import { startProject, type ProjectActionState } from "./actions";

export function NewProjectForm() {
  const [state, action, pending] = useActionState<ProjectActionState, FormData>(startProject, {
    ok: false,
  });
  const formRef = useFocusFirstError(state);
  return (
    <form ref={formRef} action={action} className="space-y-3" aria-label="New project">
      <FormField
        name="title"
        label="Project name"
        placeholder="e.g. Our house, roof collectors"
        defaultValue={state.values?.title ?? ""}
        errors={state.fieldErrors}
      />
      <p aria-live="polite" className="text-sm text-level-stop">
        {state.ok ? "" : (state.message ?? "")}
      </p>
      <Button type="submit" disabled={pending}>
        {pending ? "Creating…" : "Start describing the system"}
      </Button>
    </form>
  );
}
