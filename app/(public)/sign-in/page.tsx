import type { Metadata } from "next";
import Link from "next/link";
import { AuthCard } from "@/components/auth/auth-card";
import { SignInForm } from "@/components/auth/sign-in-form";
import { env } from "@/lib/env";
import { safeCallbackPath } from "@/lib/safe-redirect";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({
  searchParams,
}: {
  searchParams: Promise<{ callbackUrl?: string }>;
}) {
  const { callbackUrl } = await searchParams;
  // Only paths on this site: never send someone to another origin after sign-in.
  const safe = safeCallbackPath(callbackUrl, env().APP_URL);
  return (
    <AuthCard
      title="Sign in"
      footer={
        <p className="space-x-3">
          <Link className="underline" href="/forgot-password">
            Forgotten your password?
          </Link>
          <Link className="underline" href="/sign-up">
            Create an account
          </Link>
        </p>
      }
    >
      <SignInForm callbackUrl={safe} />
    </AuthCard>
  );
}
