import type { Metadata } from "next";
import Link from "next/link";
import { AuthCard } from "@/components/auth/auth-card";
import { Button } from "@/components/ui/button";
import { confirmEmail } from "@/components/auth/actions";

export const metadata: Metadata = { title: "Confirm your e-mail address" };

// The link only opens this page; the address is confirmed by the button, so a mail scanner
// that follows links cannot use up the token.
export default async function VerifyEmailPage({
  searchParams,
}: {
  searchParams: Promise<{ token?: string; done?: string; failed?: string }>;
}) {
  const { token, done, failed } = await searchParams;
  return (
    <AuthCard title="Confirm your e-mail address">
      {done ? (
        <p role="status" className="text-level-ok">
          Thank you: your address is confirmed.{" "}
          <Link className="underline" href="/dashboard">
            Go to your dashboard
          </Link>
        </p>
      ) : failed || !token ? (
        <p role="alert">This link has expired or was already used. Sign in to ask for a new one.</p>
      ) : (
        <form action={confirmEmail}>
          <input type="hidden" name="token" value={token} />
          <Button type="submit" className="w-full">
            Confirm my address
          </Button>
        </form>
      )}
    </AuthCard>
  );
}
