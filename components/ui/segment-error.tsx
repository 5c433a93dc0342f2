"use client";

import { ProblemPage } from "./problem-page";
import { Button } from "./button";

/** A failure we did not expect: nothing saved is lost; the person can try again. */
export function SegmentError({
  reset,
  homeHref,
  homeLabel,
}: {
  reset: () => void;
  homeHref: string;
  homeLabel: string;
}) {
  return (
    <ProblemPage
      title="Something went wrong on our side"
      message="Nothing you saved is lost. Try again; if it keeps happening, come back in a few minutes."
      homeHref={homeHref}
      homeLabel={homeLabel}
    >
      <Button type="button" className="mt-4" onClick={reset}>
        Try again
      </Button>
    </ProblemPage>
  );
}
