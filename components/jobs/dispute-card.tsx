import { TRANSITIONS } from "@/lib/jobs";
import { Card } from "@/components/ui/card";
import { ActionForm } from "@/components/ui/action-form";
import { disputeAction } from "./actions";

/** The homeowner's way to dispute a delivered report, on the job page and the report page. */
export function DisputeCard({ jobId, openUntil }: { jobId: number; openUntil: string }) {
  return (
    <Card>
      <h2 className="text-xl font-bold">Something wrong with the report?</h2>
      <p className="mt-1">
        Open a dispute before {openUntil}: the payment stays held and the Loopwright team settles
        it.
      </p>
      <ActionForm
        action={disputeAction}
        fields={{ jobId }}
        submitLabel={TRANSITIONS.openDispute.label}
        variant="secondary"
        className="mt-3"
      >
        <label className="block font-semibold" htmlFor="dispute-reason">
          What is wrong
        </label>
        <textarea
          id="dispute-reason"
          name="reason"
          required
          minLength={20}
          maxLength={4000}
          rows={4}
          className="w-full rounded-lg border border-slate-300 p-3"
        />
      </ActionForm>
    </Card>
  );
}
