import { NextResponse, type NextFetchEvent, type NextRequest } from "next/server";
import { withAuth, type NextRequestWithAuth } from "next-auth/middleware";
import { env } from "@/lib/env";
import { decodeSessionToken } from "@/lib/server/auth/jwt";
import { contentSecurityPolicy, makeNonce, STATIC_PAGES } from "@/lib/security-headers";
import { databaseReachable } from "@/lib/data/health";
import { UNAVAILABLE_HTML, UNAVAILABLE_CSP } from "@/lib/unavailable";

// next-auth reads the cookie name (Secure prefix or not) from NEXTAUTH_URL; ours is APP_URL.
process.env.NEXTAUTH_URL ??= env().APP_URL;

/** App pages: signed-out visitors are sent to sign-in (every page still checks for itself). */
const SIGNED_IN_PREFIXES = [
  "/dashboard",
  "/projects",
  "/board",
  "/requests",
  "/jobs",
  "/settings",
  "/reviewer",
  "/admin",
];
const needsSignIn = (path: string) =>
  SIGNED_IN_PREFIXES.some((p) => path === p || path.startsWith(`${p}/`));

const signInRedirect = withAuth({
  pages: { signIn: "/sign-in" },
  secret: env().NEXTAUTH_SECRET,
  jwt: { decode: decodeSessionToken },
});

/** Next.js's default server action body limit (1 MB, `experimental.serverActions.bodySizeLimit`). */
export const ACTION_BODY_LIMIT = 1024 * 1024;

const plain = (status: number, message: string) =>
  new NextResponse(message, {
    status,
    headers: { "content-type": "text/plain; charset=utf-8", "cache-control": "no-store" },
  });

/**
 * A server action POST that Next.js would refuse with a 500: from a foreign Origin (its CSRF
 * check) or with a body over the limit (or of unknown length). Refused here with 403, 413 or 411
 * and a plain message.
 */
function refuseAction(req: NextRequest): NextResponse | null {
  // Next.js treats a POST with a next-action header, or any multipart POST (a form without
  // JavaScript), as a possible action.
  const multipart = (req.headers.get("content-type") ?? "").startsWith("multipart/form-data");
  if (req.method !== "POST" || (!req.headers.has("next-action") && !multipart)) return null;
  const origin = req.headers.get("origin");
  if (origin) {
    let originHost: string | null = null;
    try {
      originHost = new URL(origin).host;
    } catch {
      originHost = null;
    }
    // The host Next.js compares against: the first X-Forwarded-Host, else Host.
    const host =
      req.headers.get("x-forwarded-host")?.split(",")[0]?.trim() || req.headers.get("host");
    if (!originHost || originHost !== host)
      return plain(403, "This form was sent from another site, so it was refused.");
  }
  const declared = req.headers.get("content-length");
  // Browsers always declare the length of an action's body; without it, Next.js would read up to
  // the limit and then fail with a 500.
  if (declared === null)
    return plain(411, "Send the length of what you send (the Content-Length header).");
  if (Number(declared) > ACTION_BODY_LIMIT)
    return plain(413, "What you sent is larger than 1 MB. Send less at once.");
  return null;
}

/**
 * Every page: a 503 while the database cannot be reached (lib/data/health.ts), the cheap redirect to sign-in for app pages, then a Content-Security-Policy with
 * a fresh nonce (none for the prerendered STATIC_PAGES). The nonce goes on the request too, where Next.js finds it and puts it on the
 * scripts it renders; the response carries the policy the browser enforces.
 */
export default async function proxy(req: NextRequest, event: NextFetchEvent) {
  const refused = refuseAction(req);
  if (refused) return refused;
  // No database, no page: a plain 503 that says so, rather than an error page per render.
  // Server actions answer for themselves, in the form ("briefly unavailable").
  if (!req.headers.has("next-action") && !(await databaseReachable())) {
    return new NextResponse(UNAVAILABLE_HTML, {
      status: 503,
      headers: {
        "content-type": "text/html; charset=utf-8",
        "retry-after": "15",
        "cache-control": "no-store",
        "content-security-policy": UNAVAILABLE_CSP,
      },
    });
  }
  if (needsSignIn(req.nextUrl.pathname)) {
    const redirect = await signInRedirect(req as NextRequestWithAuth, event);
    if (redirect) return redirect;
  }
  const e = env();
  // A prerendered page is the same for everyone: no nonce (it could not carry one), and the
  // cache may keep it. Every other page gets a fresh nonce.
  const nonce = STATIC_PAGES.has(req.nextUrl.pathname) ? null : makeNonce();
  const csp = contentSecurityPolicy({
    nonce,
    appUrl: e.APP_URL,
    // The browser PUTs uploads straight to the ingest's presigned URLs.
    connectUrls: [e.UPLOADTHING_INGEST_URL],
    dev: process.env.NODE_ENV === "development",
  });
  // Next.js finds the nonce in the request's CSP header and puts it on the scripts it renders.
  const headers = new Headers(req.headers);
  if (nonce !== null) headers.set("content-security-policy", csp);
  const res = NextResponse.next({ request: { headers } });
  res.headers.set("content-security-policy", csp);
  return res;
}

export const config = {
  // Pages only: route handlers answer JSON or files, and static assets need no policy.
  matcher: [
    "/((?!api/|_next/static/|_next/image|favicon.ico|icon.svg|icon-192.png|icon-512.png|apple-icon.png|social.png|manifest.webmanifest|robots.txt).*)",
  ],
};
