import NextAuth from "next-auth";
import { authOptions } from "@/lib/server/auth/options";
import { db } from "@/lib/server/db";
import { clientAddress } from "@/lib/server/client-address";
import { errorResponse } from "@/lib/server/http";
import { badRequest } from "@/lib/data/errors";
import { recordSignInFailure, recordSignInSuccess, signInWait } from "@/lib/data/rate-limit";
import { env } from "@/lib/env";

type Ctx = { params: Promise<{ nextauth: string[] }> };

const handler = (req: Request, ctx: Ctx) => NextAuth(req as never, ctx as never, authOptions());

/** next-auth sets its session cookie only when the password was right. */
const signedIn = (res: Response) =>
  res.headers.getSetCookie().some((c) => /^(__Secure-)?next-auth\.session-token=[^;]/.test(c));

/**
 * Every sign-in POST (`/api/auth/callback/<provider>/<anything>`: next-auth reads only the first
 * two segments) is limited before next-auth sees it: failures per account and address with
 * backoff, per address, and an e-mail to the account holder after many (lib/data/rate-limit.ts).
 * Only failures count. Over the limit the answer is 429 with a URL the sign-in form turns into a
 * plain message; a body that is not the sign-in form is a 400.
 */
async function POST(req: Request, ctx: Ctx) {
  const { nextauth } = await ctx.params;
  if (nextauth[0]?.toLowerCase() !== "callback") return handler(req, ctx);
  try {
    const form = await req
      .clone()
      .formData()
      .catch(() => {
        throw badRequest("Send the sign-in form: e-mail and password.");
      });
    const email = String(form.get("email") ?? "")
      .trim()
      .toLowerCase();
    const address = clientAddress(req.headers);
    const wait = await signInWait(db(), email, address);
    if (wait > 0) {
      return Response.json(
        {
          error: "Too many sign-in attempts. Try again in a few minutes.",
          url: `${env().APP_URL}/sign-in?error=RateLimited`,
        },
        { status: 429, headers: { "retry-after": String(wait) } },
      );
    }
    const res = await handler(req, ctx);
    if (signedIn(res)) await recordSignInSuccess(db(), email, address);
    else await recordSignInFailure(db(), email, address, env().APP_URL);
    return res;
  } catch (err) {
    return errorResponse(err);
  }
}

export { handler as GET, POST };
