"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import { useRouter } from "next/navigation";
import { safeCallbackPath } from "@/lib/safe-redirect";
import { emailRules, passwordRules } from "@/lib/validation/auth-rules";
import { Button } from "@/components/ui/button";
import { TextField } from "./text-field";

const MESSAGES: Record<string, string> = {
  CredentialsSignin: "That e-mail and password do not match an account.",
  RateLimited:
    "Too many sign-in attempts. Wait a few minutes, then try again, or reset your password.",
};

interface SignInInput {
  email: string;
  password: string;
}

export function SignInForm({ callbackUrl }: { callbackUrl: string }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  // The browser checks with react-hook-form's rules; the sign-in handler parses with zod.
  const form = useForm<SignInInput>({
    defaultValues: { email: "", password: "" },
  });
  const onSubmit = async (values: SignInInput) => {
    setError(null);
    // next-auth's client is fetched when the form is sent, not with the page.
    const { signIn } = await import("next-auth/react");
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
      <TextField
        form={form}
        name="email"
        label="E-mail"
        type="email"
        autoComplete="email"
        rules={emailRules}
      />
      <TextField
        form={form}
        name="password"
        label="Password"
        type="password"
        autoComplete="current-password"
        rules={passwordRules}
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
