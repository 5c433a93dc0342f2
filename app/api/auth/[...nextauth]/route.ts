import NextAuth from "next-auth";
import { authOptions } from "@/lib/server/auth/options";
import { db } from "@/lib/server/db";
import { hit, SIGN_IN_LIMITS } from "@/lib/data/rate-limit";
import { env } from "@/lib/env";

type Ctx = { params: Promise<{ nextauth: string[] }> };

const handler = (req: Request, ctx: Ctx) => NextAuth(req as never, ctx as never, authOptions());

function clientAddress(req: Request): string {
  return (
    req.headers.get("x-forwarded-for")?.split(",")[0]?.trim() ||
    req.headers.get("x-real-ip") ||
    "local"
  );
}

/**
 * Sign-in attempts are limited per account and per address before next-auth sees them; over
 * the limit the answer is 429 with a URL the sign-in form turns into a plain message.
 */
async function POST(req: Request, ctx: Ctx) {
  const { nextauth } = await ctx.params;
  if (nextauth.join("/") === "callback/credentials") {
    const form = await req.clone().formData();
    const email = String(form.get("email") ?? "")
      .trim()
      .toLowerCase();
    const [account, address] = await Promise.all([
      hit(db(), `signin:account:${email}`, SIGN_IN_LIMITS.perAccount, SIGN_IN_LIMITS.windowMs),
      hit(
        db(),
        `signin:address:${clientAddress(req)}`,
        SIGN_IN_LIMITS.perAddress,
        SIGN_IN_LIMITS.windowMs,
      ),
    ]);
    if (!account.allowed || !address.allowed) {
      const retry = Math.max(account.retryAfterS, address.retryAfterS);
      return Response.json(
        {
          error: "Too many sign-in attempts. Try again in a few minutes.",
          url: `${env().APP_URL}/sign-in?error=RateLimited`,
        },
        { status: 429, headers: { "retry-after": String(retry) } },
      );
    }
  }
  return handler(req, ctx);
}

export { handler as GET, POST };
