"use client";

import { useActionState } from "react";
import { idleState, type ActionState } from "@/lib/types/action";
import { cn } from "@/lib/cn";
import { Button, type ButtonSize, type ButtonVariant } from "./button";

export interface ActionFormProps {
  action: (prev: ActionState, formData: FormData) => Promise<ActionState>;
  /** Hidden fields sent with the form (ids, the kind of change). */
  fields?: Record<string, string | number>;
  submitLabel: string;
  pendingLabel?: string;
  /** Asked with the browser's confirm box before the form is sent. */
  confirm?: string;
  variant?: ButtonVariant;
  className?: string;
  /** 44 px by default. */
  buttonSize?: ButtonSize;
  /** Accessible name of the button when the label alone is ambiguous (one per row of a table). */
  buttonAriaLabel?: string;
  /** Extra inputs shown above the button. */
  children?: React.ReactNode;
}

/**
 * A small form around one server action: it shows the pending state and the action's answer
 * (success or refusal) beside the button, so a refused change never lands on an error page.
 */
export function ActionForm({
  action,
  fields = {},
  submitLabel,
  pendingLabel,
  confirm,
  variant = "ghost",
  className,
  buttonSize = "compact",
  buttonAriaLabel,
  children,
}: ActionFormProps) {
  const [state, formAction, pending] = useActionState(action, idleState);
  return (
    <form
      action={formAction}
      className={cn("space-y-1", className)}
      onSubmit={(e) => {
        if (confirm && !window.confirm(confirm)) e.preventDefault();
      }}
    >
      {Object.entries(fields).map(([name, value]) => (
        <input key={name} type="hidden" name={name} value={String(value)} />
      ))}
      {children}
      <Button
        type="submit"
        variant={variant}
        disabled={pending}
        aria-label={buttonAriaLabel}
        size={buttonSize}
      >
        {pending ? (pendingLabel ?? `${submitLabel}…`) : submitLabel}
      </Button>
      <p
        role={state.ok ? "status" : "alert"}
        aria-live="polite"
        className={cn("text-sm", state.ok ? "text-level-ok" : "font-semibold text-level-stop")}
      >
        {state.message ?? ""}
      </p>
    </form>
  );
}
