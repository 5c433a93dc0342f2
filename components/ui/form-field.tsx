import { Field, inputClass } from "./field";

export interface FormFieldProps extends Omit<React.InputHTMLAttributes<HTMLInputElement>, "name"> {
  name: string;
  label: string;
  unit?: string;
  hint?: string;
  errors?: Record<string, string[]>;
}

/** A plain (server-action) form input with its label, unit and server-side error. */
export function FormField({ name, label, unit, hint, errors, ...input }: FormFieldProps) {
  const id = `f-${name}`;
  const error = errors?.[name]?.[0];
  return (
    <Field id={id} label={label} unit={unit} hint={hint} error={error}>
      <input
        id={id}
        name={name}
        className={inputClass}
        aria-invalid={error ? true : undefined}
        aria-describedby={`${id}-error`}
        {...input}
      />
    </Field>
  );
}
