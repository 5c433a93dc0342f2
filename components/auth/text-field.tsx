"use client";

import type { FieldValues, Path, RegisterOptions, UseFormReturn } from "react-hook-form";
import { Field, inputClass } from "@/components/ui/field";

export interface TextFieldProps<T extends FieldValues> {
  form: UseFormReturn<T>;
  name: Path<T>;
  label: string;
  type?: string;
  autoComplete?: string;
  hint?: string;
  serverError?: string;
  /** The browser's checks (react-hook-form rules); the server checks again. */
  rules?: RegisterOptions<T, Path<T>>;
}

/** A text input bound to react-hook-form, with its error (client or server) beside it. */
export function TextField<T extends FieldValues>({
  form,
  name,
  label,
  type = "text",
  autoComplete,
  hint,
  serverError,
  rules,
}: TextFieldProps<T>) {
  const id = `f-${String(name)}`;
  const error = (form.formState.errors[name]?.message as string | undefined) ?? serverError;
  return (
    <Field id={id} label={label} hint={hint} error={error}>
      <input
        id={id}
        type={type}
        autoComplete={autoComplete}
        className={inputClass}
        aria-invalid={error ? true : undefined}
        aria-describedby={`${id}-error`}
        {...form.register(name, rules)}
      />
    </Field>
  );
}
