"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { safeCallbackPath } from "@/lib/safe-redirect";
import { signInSchema, type SignInInput } from "@/lib/validation/auth";
import { Button } from "@/components/ui/button";
import { TextField } from "./text-field";

const MESSAGES: Record<string, string> = {
  CredentialsSignin: "That e-mail and password do not match an account.",
  RateLimited:
    "Too many sign-in attempts. Wait a few minutes, then try again, or reset your password.",
};

export function SignInForm({ callbackUrl }: { callbackUrl: string }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const form = useForm<SignInInput>({
    resolver: zodResolver(signInSchema),
    defaultValues: { email: "", password: "" },
  });
  const onSubmit = async (values: SignInInput) => {
    setError(null);
    const r = await signIn("credentials", { ...values, redirect: false });
    if (r?.ok && !r.error) {
      // The page sends a checked path; check again here, against where the browser really is.
      router.push(safeCallbackPath(callbackUrl, window.location.origin));
      router.refresh();
      return;
    }
    setError(MESSAGES[r?.error ?? ""] ?? "We could not sign you in just now. Please try again.");
  };
  return (
    <form
      onSubmit={form.handleSubmit(onSubmit)}
      noValidate
      className="space-y-3"
      aria-label="Sign in"
    >
      <TextField form={form} name="email" label="E-mail" type="email" autoComplete="email" />
      <TextField
        form={form}
        name="password"
        label="Password"
        type="password"
        autoComplete="current-password"
      />
      <p role="alert" aria-live="polite" className="text-sm font-medium text-level-stop">
        {error ?? ""}
      </p>
      <Button type="submit" disabled={form.formState.isSubmitting} className="w-full">
        {form.formState.isSubmitting ? "Signing in…" : "Sign in"}
      </Button>
    </form>
  );
}
