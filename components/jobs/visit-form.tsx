"use client";

import { useActionState } from "react";
import { idleState, type ActionState } from "@/lib/types/action";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";

export interface VisitFormProps {
  action: (prev: ActionState, formData: FormData) => Promise<ActionState>;
  fields: Record<string, string | number>;
  /** "propose": a date and time (and a note); "another": the homeowner's note. */
  mode: "propose" | "another";
  submitLabel: string;
  /** For "propose": the window's first and last day and the time already proposed. */
  min?: string;
  max?: string;
  current?: string;
}

/** The site-visit forms, with the server's errors beside each field. */
export function VisitForm({
  action,
  fields,
  mode,
  submitLabel,
  min,
  max,
  current,
}: VisitFormProps) {
  const [state, formAction, pending] = useActionState(action, idleState);
  const v = state.values;
  const e = state.fieldErrors;
  const note = (
    <Field
      id={`visit-note-${mode}`}
      label={
        mode === "propose" ? "Note for the homeowner (optional)" : "Which days or times suit you"
      }
      error={e?.note?.[0]}
    >
      <textarea
        id={`visit-note-${mode}`}
        name="note"
        rows={2}
        maxLength={1000}
        required={mode === "another"}
        className={inputClass}
        defaultValue={typeof v?.note === "string" ? v.note : ""}
        aria-invalid={e?.note ? true : undefined}
        aria-describedby={`visit-note-${mode}-error`}
      />
    </Field>
  );
  return (
    <form action={formAction} className="space-y-2">
      {Object.entries(fields).map(([name, value]) => (
        <input key={name} type="hidden" name={name} value={String(value)} />
      ))}
      {mode === "propose" ? (
        <Field
          id="visit-at"
          label="Date and time of the visit"
          hint="Inside the homeowner's window, in local time."
          error={e?.at?.[0]}
        >
          <input
            id="visit-at"
            name="at"
            type="datetime-local"
            required
            min={min}
            max={max}
            className={inputClass}
            defaultValue={typeof v?.at === "string" ? v.at : (current ?? "")}
            aria-invalid={e?.at ? true : undefined}
            aria-describedby="visit-at-error"
          />
        </Field>
      ) : null}
      {note}
      <Button
        type="submit"
        variant={mode === "propose" ? "primary" : "secondary"}
        disabled={pending}
        size="compact"
      >
        {pending ? "Sending…" : submitLabel}
      </Button>
      <p
        role={state.ok ? "status" : "alert"}
        aria-live="polite"
        className={state.ok ? "text-sm text-level-ok" : "text-sm font-semibold text-level-stop"}
      >
        {state.message ?? ""}
      </p>
    </form>
  );
}
