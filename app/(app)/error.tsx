"use client";

import { ProblemPage } from "@/components/ui/problem-page";
import { Button } from "@/components/ui/button";

/** A failure we did not expect: nothing the person typed was sent twice; they can try again. */
export default function AppError({
  reset,
}: {
  error: Error & { digest?: string };
  reset: () => void;
}) {
  return (
    <ProblemPage
      title="Something went wrong on our side"
      message="Nothing you saved is lost. Try again; if it keeps happening, come back in a few minutes."
      homeHref="/dashboard"
      homeLabel="Back to your dashboard"
    >
      <Button type="button" className="mt-4" onClick={reset}>
        Try again
      </Button>
    </ProblemPage>
  );
}
