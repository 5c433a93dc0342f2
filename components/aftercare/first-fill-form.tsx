"use client";

import { useActionState } from "react";
import { idleState } from "@/lib/types/action";
import type { FirstFillRecord } from "@/lib/types/aftercare";
import { cn } from "@/lib/cn";
import { Button } from "@/components/ui/button";
import { FormField } from "@/components/ui/form-field";
import { countersignAction, saveFirstFillAction } from "./actions";

const FIELDS: {
  name: keyof FirstFillRecord;
  label: string;
  unit: string;
  hint: string;
  step: string;
}[] = [
  {
    name: "coldFillBar",
    label: "Cold fill pressure",
    unit: "bar",
    hint: "On the pump station's gauge, loop cold, collector covered.",
    step: "0.01",
  },
  {
    name: "prechargeBar",
    label: "Vessel pre-charge, measured before filling",
    unit: "bar",
    hint: "Tyre gauge at the vessel's gas valve, vessel empty of fluid.",
    step: "0.01",
  },
  {
    name: "hotBar",
    label: "Hot pressure",
    unit: "bar",
    hint: "On the same gauge, once the loop has run hot.",
    step: "0.01",
  },
  {
    name: "hotTempC",
    label: "Temperature at that reading",
    unit: "°C",
    hint: "The collector temperature on the controller when you read the hot pressure.",
    step: "0.1",
  },
  {
    name: "glycolPercentMass",
    label: "Glycol concentration (refractometer)",
    unit: "% by mass",
    hint: "Or leave empty and give the freeze point instead.",
    step: "0.1",
  },
  {
    name: "freezePointC",
    label: "Freeze point the refractometer shows",
    unit: "°C",
    hint: "Or leave empty and give the concentration instead.",
    step: "0.1",
  },
  {
    name: "flowLph",
    label: "Flow rate seen on the meter",
    unit: "L/h",
    hint: "With the pump running at its set speed.",
    step: "1",
  },
];

const asText = (v: unknown) => (v === null || v === undefined ? "" : String(v));

/** The homeowner's first-fill readings; bounds are checked on the server and shown per field. */
export function FirstFillForm({
  jobId,
  projectId,
  record,
}: {
  jobId: number;
  projectId: number;
  record: FirstFillRecord | null;
}) {
  const [state, action, pending] = useActionState(saveFirstFillAction, idleState);
  const typed = state.values;
  const value = (name: string) =>
    typed ? asText(typed[name]) : asText(record?.[name as keyof FirstFillRecord]);
  return (
    <form action={action} className="space-y-4" aria-label="First-fill readings" noValidate>
      <input type="hidden" name="jobId" value={jobId} />
      <input type="hidden" name="projectId" value={projectId} />
      <div className="grid gap-x-4 sm:grid-cols-2">
        {FIELDS.map((f) => (
          <FormField
            key={f.name}
            name={f.name}
            label={f.label}
            unit={f.unit}
            hint={f.hint}
            inputMode="decimal"
            defaultValue={value(f.name)}
            errors={state.fieldErrors}
          />
        ))}
      </div>
      <label className="block">
        <span className="text-sm font-semibold">Notes</span>
        <textarea
          name="notes"
          rows={3}
          maxLength={4000}
          defaultValue={value("notes")}
          className="mt-1 w-full rounded-lg border border-slate-300 p-3"
        />
        <span className="text-sm font-medium text-level-stop">
          {state.fieldErrors?.notes?.[0] ?? ""}
        </span>
      </label>
      <Button type="submit" disabled={pending}>
        {pending ? "Saving…" : record ? "Save the corrected readings" : "Save the readings"}
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

/** The reviewer's countersign, with an optional comment. */
export function CountersignForm({ jobId, projectId }: { jobId: number; projectId: number }) {
  const [state, action, pending] = useActionState(countersignAction, idleState);
  return (
    <form action={action} className="space-y-2" aria-label="Countersign">
      <input type="hidden" name="jobId" value={jobId} />
      <input type="hidden" name="projectId" value={projectId} />
      <label className="block">
        <span className="font-semibold">Comment with your countersign</span>
        <textarea
          name="comment"
          rows={3}
          maxLength={2000}
          className="mt-1 w-full rounded-lg border border-slate-300 p-3"
        />
        <span className="text-sm font-medium text-level-stop">
          {state.fieldErrors?.comment?.[0] ?? ""}
        </span>
      </label>
      <Button type="submit" disabled={pending}>
        {pending ? "Countersigning…" : "Countersign the record"}
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
