"use client";

import { cautionForSection, StepCaution } from "@/components/ui/caution";
import {
  get,
  useFieldArray,
  type FieldErrors,
  type Path,
  type UseFormReturn,
} from "react-hook-form";
import { Field, inputClass } from "@/components/ui/field";
import { Button } from "@/components/ui/button";
import type { SystemInput } from "@/lib/validation/system";
import type { FieldDef, SectionDef } from "./system-fields";

type Form = UseFormReturn<SystemInput>;

const toId = (name: string) => `f-${name.replace(/[.[\]]+/g, "-")}`;

function errorText(errors: FieldErrors<SystemInput>, name: string): string | undefined {
  const e = get(errors, name) as { message?: string } | undefined;
  return e?.message;
}

/** Empty number inputs become undefined (optional fields) instead of NaN. */
const asNumber = (v: unknown) =>
  v === "" || v === null || v === undefined ? undefined : Number(v);

function Control({ form, def, name }: { form: Form; def: FieldDef; name: Path<SystemInput> }) {
  const { register, formState } = form;
  const id = toId(name);
  const error = errorText(formState.errors, name);
  const aria = {
    "aria-invalid": error ? true : undefined,
    "aria-describedby": `${id}-error`,
  } as const;
  const path = name;
  if (def.kind === "checkbox") {
    return (
      <div className="flex flex-col gap-1">
        <label htmlFor={id} className="flex min-h-12 items-center gap-3 text-base">
          <input
            id={id}
            type="checkbox"
            className="h-6 w-6 accent-copper-600"
            {...aria}
            {...register(path)}
          />
          {def.label}
        </label>
        <p id={`${id}-error`} aria-live="polite" className="text-sm text-level-stop">
          {error ?? ""}
        </p>
      </div>
    );
  }
  return (
    <Field
      id={id}
      label={def.label}
      unit={def.kind === "number" ? def.unit : undefined}
      hint={def.hint}
      error={error}
    >
      {def.kind === "select" ? (
        <select id={id} className={inputClass} {...aria} {...register(path)}>
          {def.options.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
      ) : def.kind === "number" ? (
        <input
          id={id}
          type="number"
          inputMode="decimal"
          step={def.step ?? "any"}
          className={inputClass}
          {...aria}
          {...register(path, { setValueAs: asNumber })}
        />
      ) : (
        <input
          id={id}
          type="text"
          className={inputClass}
          {...aria}
          {...register(
            path,
            def.optional ? { setValueAs: (v: string) => (v === "" ? undefined : v) } : {},
          )}
        />
      )}
    </Field>
  );
}

function ListFields({ form, list }: { form: Form; list: NonNullable<SectionDef["list"]> }) {
  const { fields, append, remove } = useFieldArray({
    control: form.control,
    name: list.name,
  });
  const listError = errorText(form.formState.errors, list.name);
  return (
    <div className="space-y-4">
      {fields.map((row, index) => (
        <fieldset key={row.id} className="rounded-lg border border-slate-200 p-4">
          <legend className="px-1 font-semibold">
            {list.itemLabel} {index + 1}
          </legend>
          <div className="grid gap-x-4 gap-y-2 sm:grid-cols-2">
            {list.fields.map((def) => (
              <Control
                key={def.name}
                form={form}
                def={def}
                // The row's field names are the row schema's own keys (see system-fields).
                name={`${list.name}.${index}.${def.name}` as Path<SystemInput>}
              />
            ))}
          </div>
          <Button type="button" variant="ghost" onClick={() => remove(index)} className="mt-2">
            Remove {list.itemLabel.toLowerCase()} {index + 1}
          </Button>
        </fieldset>
      ))}
      {listError ? (
        <p role="alert" className="text-sm font-medium text-level-stop">
          {listError}
        </p>
      ) : null}
      <Button type="button" variant="secondary" onClick={() => append(list.empty as never)}>
        Add {list.itemLabel.toLowerCase()}
      </Button>
    </div>
  );
}

/** One section of the system description, rendered from its field list. */
export function SectionFields({ form, section }: { form: Form; section: SectionDef }) {
  return (
    <fieldset className="space-y-3" data-section={section.id}>
      <legend className="text-xl font-bold text-slate-900">{section.title}</legend>
      {cautionForSection(section.id) ? <StepCaution step={cautionForSection(section.id)!} /> : null}
      {section.fields.length > 0 ? (
        <div className="grid gap-x-4 gap-y-2 sm:grid-cols-2">
          {section.fields.map((def) => (
            <Control key={def.name} form={form} def={def} name={def.name} />
          ))}
        </div>
      ) : null}
      {section.list ? <ListFields form={form} list={section.list} /> : null}
    </fieldset>
  );
}
