import type { Metadata } from "next";
import Link from "next/link";
import { AuthCard } from "@/components/auth/auth-card";
import { SignUpForm } from "@/components/auth/sign-up-form";
import { cn } from "@/lib/cn";

export const metadata: Metadata = { title: "Create an account" };

export default async function SignUpPage({
  searchParams,
}: {
  searchParams: Promise<{ as?: string }>;
}) {
  const role = (await searchParams).as === "reviewer" ? "reviewer" : "homeowner";
  const tab = (r: string) =>
    cn(
      "flex-1 rounded-lg px-4 py-3 text-center font-semibold",
      r === role ? "bg-copper-600 text-white" : "bg-white text-slate-800 border border-slate-300",
    );
  return (
    <AuthCard
      title="Create an account"
      footer={
        <p>
          Already have one?{" "}
          <Link className="underline" href="/sign-in">
            Sign in
          </Link>
        </p>
      }
    >
      <nav aria-label="Account type" className="mb-4 flex gap-2">
        <Link
          href="/sign-up"
          className={tab("homeowner")}
          aria-current={role === "homeowner" ? "page" : undefined}
        >
          I am a homeowner
        </Link>
        <Link
          href="/sign-up?as=reviewer"
          className={tab("reviewer")}
          aria-current={role === "reviewer" ? "page" : undefined}
        >
          I am a plumber or heating engineer
        </Link>
      </nav>
      <p className="mb-4 text-sm text-slate-600">
        {role === "reviewer"
          ? "After signing up, add your trade profile and upload your credentials. You can quote once an admin has verified them."
          : "Describe your system, run the loop check and ask for a review from a verified solar-competent tradesperson."}
      </p>
      <SignUpForm key={role} role={role} />
    </AuthCard>
  );
}
