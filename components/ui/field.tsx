import { clsx } from "clsx";

export interface FieldProps {
  id: string;
  label: string;
  unit?: string;
  hint?: string;
  error?: string;
  children: React.ReactNode;
  className?: string;
}

/** A labelled form control with its unit, a hint and an error announced to screen readers. */
export function Field({ id, label, unit, hint, error, children, className }: FieldProps) {
  return (
    <div className={clsx("flex flex-col gap-1", className)}>
      <label htmlFor={id} className="text-sm font-semibold text-slate-800">
        {label}
        {unit ? <span className="ml-1 font-normal text-slate-500">({unit})</span> : null}
      </label>
      {children}
      {hint && !error ? <p className="text-sm text-slate-500">{hint}</p> : null}
      <p
        id={`${id}-error`}
        aria-live="polite"
        className="min-h-0 text-sm font-medium text-level-stop"
      >
        {error ?? ""}
      </p>
    </div>
  );
}

export const inputClass =
  "min-h-12 w-full rounded-lg border border-slate-300 bg-white px-3 py-2 text-base text-slate-900 aria-[invalid=true]:border-level-stop";
