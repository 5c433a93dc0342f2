import { NextResponse, type NextFetchEvent, type NextRequest } from "next/server";
import { withAuth, type NextRequestWithAuth } from "next-auth/middleware";
import { env } from "@/lib/env";
import { contentSecurityPolicy, makeNonce } from "@/lib/security-headers";
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

const signInRedirect = withAuth({ pages: { signIn: "/sign-in" }, secret: env().NEXTAUTH_SECRET });

/**
 * Every page: a 503 while the database cannot be reached (lib/data/health.ts), the cheap redirect to sign-in for app pages, then a Content-Security-Policy with
 * a fresh nonce. The nonce goes on the request too, where Next.js finds it and puts it on the
 * scripts it renders; the response carries the policy the browser enforces.
 */
export default async function proxy(req: NextRequest, event: NextFetchEvent) {
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
  const nonce = makeNonce();
  const csp = contentSecurityPolicy({
    nonce,
    appUrl: e.APP_URL,
    // The browser PUTs uploads straight to the ingest's presigned URLs.
    connectUrls: [e.UPLOADTHING_INGEST_URL],
    dev: process.env.NODE_ENV === "development",
  });
  const headers = new Headers(req.headers);
  headers.set("x-nonce", nonce);
  headers.set("content-security-policy", csp);
  const res = NextResponse.next({ request: { headers } });
  res.headers.set("content-security-policy", csp);
  return res;
}

export const config = {
  // Pages only: route handlers answer JSON or files, and static assets need no policy.
  matcher: ["/((?!api/|_next/static/|_next/image|favicon.ico|icon.svg|robots.txt).*)"],
};
