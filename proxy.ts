import { withAuth } from "next-auth/middleware";
import { env } from "@/lib/env";

// Only the cheap redirect to sign-in: every page, action and route handler checks for itself.
export default withAuth({ pages: { signIn: "/sign-in" }, secret: env().NEXTAUTH_SECRET });

export const config = {
  matcher: [
    "/dashboard/:path*",
    "/projects/:path*",
    "/board/:path*",
    "/requests/:path*",
    "/settings/:path*",
    "/reviewer/:path*",
    "/admin/:path*",
  ],
};
