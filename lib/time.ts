/**
 * One time helper. The database keeps DATETIME(3) in UTC and hands them back as exact strings
 * ("2026-12-02 07:35:08.123"); DATE columns as "2026-12-02".
 */

/** A moment as a DATETIME(3) string, optionally shifted by `offsetMs`. */
export function sqlDateTime(d: Date = new Date(), offsetMs = 0): string {
  return new Date(d.getTime() + offsetMs).toISOString().slice(0, 23).replace("T", " ");
}

/** The UTC calendar day of a moment, as a DATE string. */
export function sqlDate(d: Date = new Date(), offsetMs = 0): string {
  return new Date(d.getTime() + offsetMs).toISOString().slice(0, 10);
}

/** A DATETIME string from the database as a Date (it is UTC). */
export function fromSqlDateTime(s: string): Date {
  return new Date(`${s.replace(" ", "T")}Z`);
}

export const DAY_MS = 86_400_000;

/** How far `timeZone`'s wall clock is ahead of UTC at the moment `at`, in ms. */
function zoneOffsetMs(at: number, timeZone: string): number {
  const parts = new Intl.DateTimeFormat("en-US", {
    timeZone,
    hourCycle: "h23",
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    second: "2-digit",
  }).formatToParts(new Date(at));
  const n = (t: string) => Number(parts.find((p) => p.type === t)?.value);
  const wall = Date.UTC(n("year"), n("month") - 1, n("day"), n("hour"), n("minute"), n("second"));
  return wall - Math.floor(at / 1000) * 1000;
}

/**
 * A wall-clock time typed in `timeZone` ("2026-12-10T10:30", as a datetime-local input sends
 * it) as the moment it names. In a spring-forward gap the later offset is used.
 */
export function zonedWallTime(local: string, timeZone: string): Date {
  const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})$/.exec(local);
  if (!m) throw new RangeError(`not a local date and time: ${local}`);
  const guess = Date.UTC(+m[1]!, +m[2]! - 1, +m[3]!, +m[4]!, +m[5]!);
  const first = guess - zoneOffsetMs(guess, timeZone);
  const second = guess - zoneOffsetMs(first, timeZone);
  return new Date(second);
}

/** A moment as the wall-clock "YYYY-MM-DDTHH:mm" in `timeZone` (for a datetime-local input). */
export function wallTimeIn(at: Date, timeZone: string): string {
  const shifted = new Date(at.getTime() + zoneOffsetMs(at.getTime(), timeZone));
  return shifted.toISOString().slice(0, 16);
}

/** A moment for people: "Thursday 10 December 2026 at 10:30 (Europe/London)". */
export function formatWhen(at: Date, timeZone: string): string {
  const text = new Intl.DateTimeFormat("en-GB", {
    dateStyle: "full",
    timeStyle: "short",
    timeZone,
  }).format(at);
  return `${text} (${timeZone.replace(/_/g, " ")})`;
}
