"use client";

import { currencySymbol } from "@/lib/labels";
import { useActionState } from "react";
import { useFocusFirstError } from "@/components/ui/use-focus-first-error";
import { REGIONS } from "@/lib/regions";
import { SPECIALISMS } from "@/lib/validation/reviewer";
import type { ReviewerProfile } from "@/lib/types/reviewers";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { FormField } from "@/components/ui/form-field";
import { saveProfile, type FormState } from "./actions";

export function ProfileForm({
  profile,
  currency,
}: {
  profile: ReviewerProfile | null;
  currency: string;
}) {
  const [state, action, pending] = useActionState<FormState, FormData>(saveProfile, { ok: false });
  const formRef = useFocusFirstError(state);
  const v = state.values;
  const val = (k: string, fallback: unknown) =>
    String((v?.[k] as string | undefined) ?? fallback ?? "");
  const e = state.fieldErrors;
  const chosen = new Set((v?.specialisms as string[] | undefined) ?? profile?.specialisms ?? []);
  return (
    // Keyed by what was last sent: after a save React resets the form to its default values, and
    // a select only takes a new default when it is mounted again (else it shows "Choose…").
    <form
      ref={formRef}
      key={JSON.stringify(v ?? null)}
      action={action}
      className="space-y-4"
      aria-label="Reviewer profile"
    >
      <div className="grid gap-x-4 gap-y-2 sm:grid-cols-2">
        <FormField
          name="tradingName"
          label="Trading name"
          defaultValue={val("tradingName", profile?.tradingName)}
          errors={e}
        />
        <FormField
          name="yearsInTrade"
          label="Years in the trade"
          type="number"
          min={0}
          defaultValue={val("yearsInTrade", profile?.yearsInTrade)}
          errors={e}
        />
        <Field id="f-region" label="Service region" error={e?.region?.[0]}>
          <select
            id="f-region"
            name="region"
            className={inputClass}
            defaultValue={val("region", profile?.region)}
            aria-describedby="f-region-error"
          >
            <option value="">Choose…</option>
            {REGIONS.map((r) => (
              <option key={r.id} value={r.id}>
                {r.name}
              </option>
            ))}
          </select>
        </Field>
        <FormField
          name="hourlyRatePounds"
          label="Hourly rate guide"
          unit={currencySymbol(currency)}
          type="number"
          step="0.01"
          defaultValue={val(
            "hourlyRatePounds",
            profile?.hourlyRateMinor != null ? profile.hourlyRateMinor / 100 : "",
          )}
          errors={e}
        />
        <FormField
          name="centreLat"
          label="Site-visit centre, latitude"
          type="number"
          step="any"
          hint="Optional: for distances to site visits"
          defaultValue={val("centreLat", profile?.centreLat)}
          errors={e}
        />
        <FormField
          name="centreLng"
          label="Site-visit centre, longitude"
          type="number"
          step="any"
          defaultValue={val("centreLng", profile?.centreLng)}
          errors={e}
        />
        <FormField
          name="travelRadiusKm"
          label="Travel radius"
          unit="km"
          type="number"
          defaultValue={val("travelRadiusKm", profile?.travelRadiusKm)}
          errors={e}
        />
      </div>
      <Field id="f-bio" label="About your work" error={e?.bio?.[0]}>
        <textarea
          id="f-bio"
          name="bio"
          rows={5}
          className={inputClass}
          defaultValue={val("bio", profile?.bio)}
          aria-describedby="f-bio-error"
        />
      </Field>
      <fieldset>
        <legend className="text-sm font-semibold">What you work on</legend>
        <div className="mt-2 grid gap-2 sm:grid-cols-2">
          {SPECIALISMS.map((s) => (
            <label key={s.id} className="flex min-h-11 items-center gap-3">
              <input
                type="checkbox"
                name="specialisms"
                value={s.id}
                defaultChecked={chosen.has(s.id)}
                className="h-6 w-6 accent-copper-600"
              />
              {s.label}
            </label>
          ))}
        </div>
      </fieldset>
      <p aria-live="polite" className={state.ok ? "text-level-ok" : "text-level-stop"}>
        {state.message ?? ""}
      </p>
      <Button type="submit" disabled={pending}>
        {pending ? "Saving…" : "Save profile"}
      </Button>
    </form>
  );
}
