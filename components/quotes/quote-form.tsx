"use client";

import { currencySymbol } from "@/lib/labels";
import { useActionState } from "react";
import { useFocusFirstError } from "@/components/ui/use-focus-first-error";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { FormField } from "@/components/ui/form-field";
import { sendQuote, type QuoteActionState } from "./actions";

export interface QuoteFormProps {
  requestId: number;
  siteVisit: boolean;
  /** The configured currency (ISO code), for the price field. */
  currency: string;
  current: {
    priceMinor: number;
    turnaroundDays: number;
    scopeMd: string;
    proposedVisitDate: string | null;
  } | null;
}

export function QuoteForm({ requestId, siteVisit, current, currency }: QuoteFormProps) {
  const [state, action, pending] = useActionState<QuoteActionState, FormData>(
    sendQuote.bind(null, requestId),
    { ok: false },
  );
  const formRef = useFocusFirstError(state);
  const v = state.values;
  const e = state.fieldErrors;
  return (
    <form ref={formRef} action={action} className="space-y-3" aria-label="Your quote">
      <div className="grid gap-x-4 sm:grid-cols-2">
        <FormField
          name="pricePounds"
          label="Price"
          unit={currencySymbol(currency)}
          type="number"
          step="0.01"
          defaultValue={v?.pricePounds ?? (current ? current.priceMinor / 100 : "")}
          errors={e}
        />
        <FormField
          name="turnaroundDays"
          label="Turnaround"
          unit="days"
          type="number"
          defaultValue={v?.turnaroundDays ?? current?.turnaroundDays ?? ""}
          errors={e}
        />
        {siteVisit ? (
          <FormField
            name="proposedVisitDate"
            label="Proposed visit date"
            type="date"
            defaultValue={v?.proposedVisitDate ?? current?.proposedVisitDate ?? ""}
            errors={e}
          />
        ) : null}
      </div>
      <Field id="f-scopeMd" label="What the review covers" error={e?.scopeMd?.[0]}>
        <textarea
          id="f-scopeMd"
          name="scopeMd"
          rows={5}
          className={inputClass}
          defaultValue={v?.scopeMd ?? current?.scopeMd ?? ""}
          aria-describedby="f-scopeMd-error"
        />
      </Field>
      <p aria-live="polite" className={state.ok ? "text-level-ok" : "text-sm text-level-stop"}>
        {state.message ?? ""}
      </p>
      <Button type="submit" disabled={pending}>
        {pending ? "Sending…" : current ? "Update my quote" : "Send quote"}
      </Button>
    </form>
  );
}
