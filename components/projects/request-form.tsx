"use client";

import { currencySymbol, SERVICE_LABELS } from "@/lib/labels";
import { StepCaution } from "@/components/ui/caution";
import { TownPicker } from "./town-picker";
import { useActionState, useEffect, useState } from "react";
import { useFocusFirstError } from "@/components/ui/use-focus-first-error";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { FormField } from "@/components/ui/form-field";
import { editRequest, postRequest, type ProjectActionState } from "./actions";

export interface RequestFormProps {
  projectId: number;
  /** The open request to edit, as form values; absent to post a new one. */
  existing?: { id: number; values: Record<string, string> };
  /** The configured currency (ISO code), for the budget fields. */
  currency: string;
  /** The loop check's `stop` findings: posting then asks for the safety acknowledgement. */
  stops?: { title: string; action: string }[];
}

export function RequestForm({ projectId, existing, currency, stops = [] }: RequestFormProps) {
  const [state, action, pending] = useActionState<ProjectActionState, FormData>(
    existing ? editRequest.bind(null, projectId, existing.id) : postRequest.bind(null, projectId),
    { ok: false },
  );
  const formRef = useFocusFirstError(state);
  const v = state.ok ? existing?.values : (state.values ?? existing?.values);
  const [kind, setKind] = useState(v?.kind ?? "remote_check");
  // React resets a form after its action runs, which puts the radios back to their first
  // default; put the chosen kind back, so a refused site-visit request is not resent as a remote
  // check.
  useEffect(() => {
    const radio = formRef.current?.querySelector<HTMLInputElement>(
      `input[name="kind"][value="${kind}"]`,
    );
    if (radio) radio.checked = true;
  }, [state, kind, formRef]);
  const e = state.fieldErrors;
  if (state.ok && !existing)
    return (
      <p role="status" className="rounded-lg bg-level-ok-bg p-4 text-level-ok">
        {state.message}
      </p>
    );
  return (
    <form ref={formRef} action={action} className="space-y-3" aria-label="Ask for a review">
      <fieldset>
        <legend className="text-sm font-semibold">Kind of review</legend>
        <div className="mt-2 flex flex-wrap gap-4">
          {[
            ["remote_check", `${SERVICE_LABELS.remote_check} (sketch and photos)`],
            ["site_visit", SERVICE_LABELS.site_visit],
          ].map(([value, label]) => (
            <label key={value} className="flex min-h-11 items-center gap-2">
              <input
                type="radio"
                name="kind"
                value={value}
                checked={kind === value}
                onChange={() => setKind(value!)}
                className="h-5 w-5 accent-copper-600"
              />{" "}
              {label}
            </label>
          ))}
        </div>
      </fieldset>
      <Field
        id="f-questions"
        label="What do you want the reviewer to answer?"
        error={e?.questions?.[0]}
      >
        <textarea
          id="f-questions"
          name="questions"
          rows={4}
          className={inputClass}
          defaultValue={v?.questions ?? ""}
          aria-describedby="f-questions-error"
        />
      </Field>
      <div className="grid gap-x-4 sm:grid-cols-2">
        <FormField
          name="budgetMinPounds"
          label="Budget from"
          unit={currencySymbol(currency)}
          type="number"
          min={1}
          defaultValue={v?.budgetMinPounds ?? ""}
          errors={e}
        />
        <FormField
          name="budgetMaxPounds"
          label="Budget up to"
          unit={currencySymbol(currency)}
          type="number"
          min={1}
          defaultValue={v?.budgetMaxPounds ?? ""}
          errors={e}
        />
      </div>
      {kind === "site_visit" ? <StepCaution step="siteVisit" /> : null}
      {kind === "site_visit" ? (
        <div className="grid gap-x-4 sm:grid-cols-2">
          <FormField
            name="windowStart"
            label="Visit window from"
            type="date"
            defaultValue={v?.windowStart ?? ""}
            errors={e}
          />
          <FormField
            name="windowEnd"
            label="Visit window to"
            type="date"
            defaultValue={v?.windowEnd ?? ""}
            errors={e}
          />
          <TownPicker error={e?.siteTownId?.[0]} />
          <details className="sm:col-span-2">
            <summary className="min-h-11 cursor-pointer py-2 text-sm font-semibold">
              Advanced: enter the site&apos;s coordinates instead
            </summary>
            <div className="grid gap-x-4 sm:grid-cols-2">
              <FormField
                name="siteLat"
                label="Site latitude (optional)"
                type="number"
                step="any"
                hint="Only for distances on the board"
                defaultValue={v?.siteLat ?? ""}
                errors={e}
              />
              <FormField
                name="siteLng"
                label="Site longitude (optional)"
                type="number"
                step="any"
                defaultValue={v?.siteLng ?? ""}
                errors={e}
              />
            </div>
          </details>
          <Field
            id="f-accessNotes"
            label="Access notes (loft hatch, scaffold, parking)"
            error={e?.accessNotes?.[0]}
            className="sm:col-span-2"
          >
            <textarea
              id="f-accessNotes"
              name="accessNotes"
              rows={2}
              className={inputClass}
              defaultValue={v?.accessNotes ?? ""}
            />
          </Field>
        </div>
      ) : null}
      <p
        aria-live="polite"
        className={
          state.ok ? "text-sm font-medium text-level-ok" : "text-sm font-medium text-level-stop"
        }
      >
        {state.message ?? ""}
      </p>
      {stops.length > 0 && !existing ? (
        <section
          aria-labelledby="safety-gate-title"
          data-testid="safety-gate"
          className="space-y-3 rounded-card border-2 border-level-stop bg-level-stop-bg p-4"
        >
          <h3 id="safety-gate-title" className="font-bold text-level-stop">
            Stop: the loop check found something unsafe as described
          </h3>
          <ul className="list-disc space-y-2 pl-5 text-slate-900">
            {stops.map((s) => (
              <li key={s.title}>
                <strong>{s.title}.</strong> {s.action}
              </li>
            ))}
          </ul>
          <p className="text-slate-900">
            A reviewer can help you put it right, but until then the loop must not be filled or run.
            A site visit lets a solar-competent tradesperson see it in place.
          </p>
          {kind !== "site_visit" ? (
            <Button type="button" variant="secondary" onClick={() => setKind("site_visit")}>
              Ask for a site visit instead
            </Button>
          ) : null}
          <label className="flex items-start gap-3 font-semibold">
            <input
              type="checkbox"
              name="acknowledgeStop"
              className="mt-1 h-5 w-5 accent-copper-600"
              aria-describedby="f-acknowledgeStop-error"
              aria-invalid={e?.acknowledgeStop ? true : undefined}
            />
            I have read why, and the loop will not be filled or run until this is resolved.
          </label>
          <p id="f-acknowledgeStop-error" className="text-sm text-level-stop">
            {e?.acknowledgeStop?.[0] ?? ""}
          </p>
        </section>
      ) : null}
      <Button type="submit" disabled={pending}>
        {pending ? "Saving…" : existing ? "Save changes" : "Post the request"}
      </Button>
    </form>
  );
}
