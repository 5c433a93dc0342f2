"use client";

import { useActionState } from "react";
import { useFocusFirstError } from "@/components/ui/use-focus-first-error";
import { CREDENTIAL_KINDS, CREDENTIAL_NAMES } from "@/lib/credentials";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { FormField } from "@/components/ui/form-field";
import { submitCredential, type FormState } from "./actions";

export function CredentialForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(submitCredential, {
    ok: false,
  });
  const formRef = useFocusFirstError(state);
  const e = state.fieldErrors;
  const v = state.ok ? undefined : state.values;
  return (
    <form
      ref={formRef}
      action={action}
      key={state.ok ? "done" : "editing"}
      className="space-y-3"
      aria-label="Add a credential"
    >
      <div className="grid gap-x-4 gap-y-2 sm:grid-cols-2">
        <Field id="f-kind" label="Kind" error={e?.kind?.[0]}>
          <select
            id="f-kind"
            name="kind"
            className={inputClass}
            defaultValue={String(v?.kind ?? "")}
            aria-invalid={e?.kind ? true : undefined}
            aria-describedby="f-kind-error"
          >
            <option value="">Choose…</option>
            {CREDENTIAL_KINDS.map((k) => (
              <option key={k} value={k}>
                {CREDENTIAL_NAMES[k]}
              </option>
            ))}
          </select>
        </Field>
        <FormField
          name="issuer"
          label="Issued by"
          defaultValue={String(v?.issuer ?? "")}
          errors={e}
        />
        <FormField
          name="number"
          label="Certificate or policy number"
          defaultValue={String(v?.number ?? "")}
          errors={e}
        />
        <FormField
          name="expiresOn"
          label="Expiry date"
          type="date"
          defaultValue={String(v?.expiresOn ?? "")}
          errors={e}
        />
      </div>
      <p aria-live="polite" className={state.ok ? "text-level-ok" : "text-level-stop"}>
        {state.message ?? ""}
      </p>
      <Button type="submit" disabled={pending}>
        {pending ? "Submitting…" : "Submit for verification"}
      </Button>
    </form>
  );
}
