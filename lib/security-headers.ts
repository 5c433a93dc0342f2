/**
 * The pages' per-request Content-Security-Policy, used by proxy.ts. The headers that are the same
 * on every response are in next.config.mjs.
 */

export interface CspOptions {
  /** A fresh random value for this response (base64). */
  nonce: string;
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
  const directives = [
    "default-src 'self'",
    `script-src 'self' 'nonce-${o.nonce}' 'strict-dynamic'${o.dev ? " 'unsafe-eval'" : ""}`,
    // <style> elements need the nonce. Style *attributes* cannot carry one, and React renders
    // `style={{…}}` props as attributes in server HTML (Recharts sizes and positions its SVG
    // that way; the upload button and Next.js' own error overlay do the same), so inline
    // attributes are allowed. A style attribute cannot run script.
    `style-src 'self' 'nonce-${o.nonce}'`,
    `style-src-elem 'self' 'nonce-${o.nonce}'`,
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
