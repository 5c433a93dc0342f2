"use client";

import { useState } from "react";
import { useRouter } from "next/navigation";
import { useForm } from "react-hook-form";
import type { SystemInput } from "@/lib/validation/system";
import type { SystemFormValues } from "@/lib/validation/system-fields";
import { Button } from "@/components/ui/button";
import { SectionFields } from "@/components/loop-check/section-fields";
import type { SectionDef } from "@/components/loop-check/system-fields";
import { saveStep } from "./actions";

export interface StepFormProps {
  projectId: number;
  /** This step's fields, from `SECTIONS` (the page passes them: the schema stays on the server). */
  section: SectionDef;
  /** The step after this one, if any. */
  next?: Pick<SectionDef, "id" | "title">;
  defaultValues: SystemFormValues;
}

/** One step of the stepped description form; saves the step as a draft and moves on. */
export function StepForm({ projectId, section, next, defaultValues }: StepFormProps) {
  const router = useRouter();
  const [message, setMessage] = useState<string | null>(null);
  const form = useForm<SystemInput>({ defaultValues });
  const step = section.id;

  const onSubmit = async (values: SystemInput) => {
    setMessage(null);
    const r = await saveStep(projectId, step, values[step]);
    if (!r.ok) {
      // The first field in error takes the keyboard focus; its message is tied to it.
      for (const [i, [path, messages]] of Object.entries(r.fieldErrors ?? {}).entries()) {
        form.setError(
          path as Parameters<typeof form.setError>[0],
          { message: messages[0] },
          { shouldFocus: i === 0 },
        );
      }
      setMessage(r.message ?? "Some values need attention.");
      return;
    }
    router.push(next ? `/projects/${projectId}/edit/${next.id}` : `/projects/${projectId}`);
    router.refresh();
  };

  return (
    <form
      onSubmit={form.handleSubmit(onSubmit)}
      noValidate
      className="space-y-4"
      aria-label={section.title}
    >
      <SectionFields form={form} section={section} />
      <p role="alert" aria-live="polite" className="font-semibold text-level-stop">
        {message ?? ""}
      </p>
      <div className="flex flex-wrap gap-3">
        <Button type="submit" disabled={form.formState.isSubmitting}>
          {form.formState.isSubmitting
            ? "Saving…"
            : next
              ? `Save and continue to ${next.title.toLowerCase()}`
              : "Save and see the loop check"}
        </Button>
      </div>
    </form>
  );
}
