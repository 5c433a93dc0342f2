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
