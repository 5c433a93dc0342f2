/**
 * The dispute window (product.md, step 8): after the report is delivered the homeowner may open
 * a dispute for `windowDays` days (the app passes `env().DISPUTE_WINDOW_DAYS`); with no action
 * the funds are released when it closes.
 *
 * The rule: the window is `windowDays` whole 24-hour periods from the delivery instant, so it
 * ends at the same clock time UTC as the delivery (168 hours for 7 days, whatever the local
 * daylight-saving changes). It is open while `now` is strictly before that end; at the end
 * instant it is closed and the release is due. The end is stored on the job as `release_due_at`
 * when the report is delivered, so changing the setting later does not move a running window.
 */

const DAY_MS = 86_400_000;

function assertDate(d: Date, name: string): void {
  if (!(d instanceof Date) || Number.isNaN(d.getTime()))
    throw new RangeError(`${name} must be a valid date`);
}

/** The instant the dispute window closes (and the release falls due) for a report delivered at `deliveredAt`. */
export function disputeOpenUntil(deliveredAt: Date, windowDays: number): Date {
  assertDate(deliveredAt, "deliveredAt");
  if (!Number.isInteger(windowDays) || windowDays < 1)
    throw new RangeError("windowDays must be a whole number of days, at least 1");
  return new Date(deliveredAt.getTime() + windowDays * DAY_MS);
}

/** The window that closes at `openUntil` is still open at `now`. */
export function isWithinDisputeWindow(openUntil: Date, now: Date): boolean {
  assertDate(openUntil, "openUntil");
  assertDate(now, "now");
  return now.getTime() < openUntil.getTime();
}
