/** A JSON column as its value: mysql2 hands JSON back as text on MariaDB, an object elsewhere. */
export function parseJson<T>(v: unknown): T {
  return (typeof v === "string" ? JSON.parse(v) : v) as T;
}
