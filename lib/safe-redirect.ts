/** Where a signed-in visitor lands when the requested place is missing or not on this site. */
export const DEFAULT_AFTER_SIGN_IN = "/dashboard";

/**
 * A `callbackUrl` made safe to redirect to: the value is parsed as the browser would parse it,
 * against the app's own origin, and only a place on that origin is kept (as path, query and
 * fragment, so the result is always a relative path starting with a single "/"). Anything
 * else — another host, a scheme-relative or backslash trick (`//evil`, `/\evil`), a tab or
 * newline that the URL parser strips (`/%09/evil`, `/\t/evil`), `javascript:` — gives
 * `fallback`.
 */
export function safeCallbackPath(
  value: string | null | undefined,
  appOrigin: string,
  fallback: string = DEFAULT_AFTER_SIGN_IN,
): string {
  if (typeof value !== "string" || value === "" || value.length > 2048) return fallback;
  let origin: string;
  try {
    origin = new URL(appOrigin).origin;
  } catch {
    return fallback;
  }
  // Decode once, as some servers and browsers do before following a Location, so an encoded
  // "//" or "\" cannot slip past; then both the raw and the decoded form must stay at home.
  let decoded = value;
  try {
    decoded = decodeURIComponent(value);
  } catch {
    return fallback;
  }
  for (const candidate of [value, decoded]) {
    let url: URL;
    try {
      url = new URL(candidate, origin);
    } catch {
      return fallback;
    }
    if (url.origin !== origin) return fallback;
  }
  const url = new URL(value, origin);
  const path = `${url.pathname}${url.search}${url.hash}`;
  // new URL normalises "/\x" and "//x" away for same-origin values, but never return a path
  // a browser could read as scheme-relative.
  if (!path.startsWith("/") || path.startsWith("//") || path.startsWith("/\\")) return fallback;
  return path;
}
