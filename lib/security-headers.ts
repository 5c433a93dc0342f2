/**
 * The pages' per-request Content-Security-Policy, used by proxy.ts. The headers that are the same
 * on every response are in next.config.mjs.
 */

/**
 * The pages built once at deploy and served as they are (prerendered: no request data, no
 * database, no user's words in them). A prerendered page cannot carry a per-request nonce, so
 * these get the policy without one (`staticPagePolicy`); every other page is rendered per
 * request with a nonce. tests/e2e/landing.test.ts checks this list against the build's
 * prerender manifest, so a page that turns static (or dynamic) without being listed fails it.
 */
export const STATIC_PAGES: ReadonlySet<string> = new Set(["/", "/loop-check", "/forgot-password"]);

export interface CspOptions {
  /**
   * A fresh random value for this response (base64), or null for a prerendered page (see
   * STATIC_PAGES).
   */
  nonce: string | null;
  /** The app's own URL (APP_URL). */
  appUrl: string;
  /** Origins the browser itself talks to: the upload ingest (the browser PUTs files there). */
  connectUrls: string[];
  /** `next dev` needs eval (React's debugging) and its websocket. */
  dev?: boolean;
}

const originOf = (url: string): string | null => {
  try {
    return new URL(url).origin;
  } catch {
    return null;
  }
};

/**
 * The Content-Security-Policy of a page. Scripts run only from our origin with this
 * response's nonce ('strict-dynamic' lets those scripts load the chunks they import); Next.js
 * puts the nonce on its own scripts when it finds it in the request's CSP header.
 */
export function contentSecurityPolicy(o: CspOptions): string {
  const https = o.appUrl.startsWith("https://");
  const connect = ["'self'", ...o.connectUrls.map(originOf).filter((x): x is string => x !== null)];
  if (o.dev) connect.push("ws:", "wss:");
  // What lets this page's own inline scripts and styles run: the nonce, or (prerendered) none.
  const inline = o.nonce === null ? "'unsafe-inline'" : `'nonce-${o.nonce}'`;
  const directives = [
    "default-src 'self'",
    // A prerendered page's inline scripts are Next.js's own, fixed at build time: without a
    // nonce they need 'unsafe-inline'. Such a page holds nothing a visitor or another user wrote
    // (STATIC_PAGES), so there is nothing for an injected script to ride in on.
    `script-src 'self' ${inline}${o.nonce === null ? "" : " 'strict-dynamic'"}${o.dev ? " 'unsafe-eval'" : ""}`,
    // <style> elements need the nonce. Style *attributes* cannot carry one, and React renders
    // `style={{…}}` props as attributes in server HTML (Recharts sizes and positions its SVG
    // that way; the upload button and Next.js' own error overlay do the same), so inline
    // attributes are allowed. A style attribute cannot run script.
    `style-src 'self' ${inline}`,
    `style-src-elem 'self' ${inline}`,
    "style-src-attr 'unsafe-inline'",
    // blob: for the preview of a photo being chosen; data: for small inline icons.
    "img-src 'self' blob: data:",
    "font-src 'self'",
    `connect-src ${[...new Set(connect)].join(" ")}`,
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-src 'none'",
    "frame-ancestors 'none'",
    "worker-src 'self' blob:",
    "manifest-src 'self'",
  ];
  if (https) directives.push("upgrade-insecure-requests");
  return directives.join("; ");
}

/** A nonce for one response: 16 random bytes, base64. */
export function makeNonce(): string {
  const bytes = new Uint8Array(16);
  crypto.getRandomValues(bytes);
  return btoa(String.fromCharCode(...bytes));
}
