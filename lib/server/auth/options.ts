import "server-only";
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { env } from "@/lib/env";
import { signInSchema } from "@/lib/validation/auth";
import { safeCallbackPath } from "@/lib/safe-redirect";
import { db } from "../db";
import { authenticate, endSessions } from "@/lib/data/accounts";
import type { Role } from "@/lib/data/actor";
import { decodeSessionToken, encodeSessionToken } from "./jwt";

/**
 * next-auth v4 with e-mail and password. The JWT carries the user id, role and session version;
 * every page, action and route handler still reads the user from the database
 * (lib/server/auth/session.ts) and refuses a token whose version is old, so sign-out, a password
 * reset, a suspension or a role change ends every copy of earlier sessions.
 */
export function authOptions(): NextAuthOptions {
  // Built once per process (env() is fixed once read): every page and JSON route asks for it.
  cachedOptions ??= buildAuthOptions();
  return cachedOptions;
}

let cachedOptions: NextAuthOptions | undefined;

function buildAuthOptions(): NextAuthOptions {
  const e = env();
  // next-auth builds its callback URLs from NEXTAUTH_URL; ours is APP_URL.
  process.env.NEXTAUTH_URL ??= e.APP_URL;
  return {
    secret: e.NEXTAUTH_SECRET,
    session: { strategy: "jwt", maxAge: 7 * 24 * 3600 },
    // next-auth's token format, with the key derived once per secret (./jwt.ts).
    jwt: { encode: encodeSessionToken, decode: decodeSessionToken },
    // httpOnly and SameSite=Lax are next-auth's defaults; Secure follows the app's scheme.
    useSecureCookies: e.APP_URL.startsWith("https://"),
    pages: { signIn: "/sign-in", error: "/sign-in" },
    providers: [
      CredentialsProvider({
        name: "E-mail and password",
        credentials: {
          email: { label: "E-mail", type: "email" },
          password: { label: "Password", type: "password" },
        },
        async authorize(credentials) {
          const parsed = signInSchema.safeParse(credentials ?? {});
          if (!parsed.success) return null;
          const user = await authenticate(db(), parsed.data.email, parsed.data.password);
          return user
            ? {
                id: String(user.id),
                email: user.email,
                name: user.displayName,
                role: user.role,
                sessionVersion: user.sessionVersion,
              }
            : null;
        },
      }),
    ],
    callbacks: {
      // Only places on this site, however the callbackUrl is spelled (see lib/safe-redirect.ts).
      redirect({ url, baseUrl }) {
        return `${new URL(baseUrl).origin}${safeCallbackPath(url, baseUrl, "/")}`;
      },
      jwt({ token, user }) {
        if (user) {
          const u = user as unknown as { role: Role; sessionVersion: number };
          token.uid = Number(user.id);
          token.role = u.role;
          token.sv = u.sessionVersion;
        }
        return token;
      },
      session({ session, token }) {
        return {
          ...session,
          user: { ...session.user, id: token.uid, role: token.role, sv: token.sv ?? 0 },
        };
      },
    },
    events: {
      // Signing out ends every copy of this session's cookie, not just the one in this browser.
      async signOut({ token }) {
        if (token?.uid) await endSessions(db(), Number(token.uid), token.sv ?? 0);
      },
    },
  };
}

declare module "next-auth/jwt" {
  interface JWT {
    uid?: number;
    role?: Role;
    /** users.session_version when the session began; an older one is no longer a session. */
    sv?: number;
  }
}
