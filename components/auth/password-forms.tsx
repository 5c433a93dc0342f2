"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import Link from "next/link";
import type { ForgotPasswordInput, ResetPasswordInput } from "@/lib/validation/auth";
import {
  confirmRules,
  emailRules,
  newPasswordRules,
  tokenRules,
} from "@/lib/validation/auth-rules";
import { Button } from "@/components/ui/button";
import { chooseNewPassword, requestReset, type ActionState } from "./actions";
import { TextField } from "./text-field";

// The browser checks with react-hook-form's rules; the server actions parse with zod.
export function ForgotPasswordForm() {
  const [state, setState] = useState<ActionState | null>(null);
  const form = useForm<ForgotPasswordInput>({
    defaultValues: { email: "" },
  });
  if (state?.ok)
    return (
      <p role="status" className="rounded-lg bg-level-ok-bg p-4 text-level-ok">
        {state.message}
      </p>
    );
  return (
    <form
      onSubmit={form.handleSubmit(async (v) => setState(await requestReset(v)))}
      noValidate
      className="space-y-3"
      aria-label="Reset password"
    >
      <TextField
        form={form}
        name="email"
        label="E-mail"
        type="email"
        autoComplete="email"
        rules={emailRules}
        serverError={state?.fieldErrors?.email?.[0]}
      />
      <Button type="submit" disabled={form.formState.isSubmitting} className="w-full">
        Send the reset link
      </Button>
    </form>
  );
}

export function ResetPasswordForm({ token }: { token: string }) {
  const [state, setState] = useState<ActionState | null>(null);
  const form = useForm<ResetPasswordInput>({
    defaultValues: { token, password: "", confirm: "" },
  });
  if (state?.ok)
    return (
      <p role="status" className="rounded-lg bg-level-ok-bg p-4 text-level-ok">
        {state.message}{" "}
        <Link className="font-semibold underline" href="/sign-in">
          Sign in
        </Link>
      </p>
    );
  const server = (k: string) => state?.fieldErrors?.[k]?.[0];
  return (
    <form
      onSubmit={form.handleSubmit(async (v) => setState(await chooseNewPassword(v)))}
      noValidate
      className="space-y-3"
      aria-label="Choose a new password"
    >
      <input type="hidden" {...form.register("token", tokenRules)} />
      <TextField
        form={form}
        name="password"
        label="New password"
        type="password"
        autoComplete="new-password"
        rules={newPasswordRules}
        serverError={server("password")}
      />
      <TextField
        form={form}
        name="confirm"
        label="New password again"
        type="password"
        autoComplete="new-password"
        rules={confirmRules}
        serverError={server("confirm")}
      />
      <p aria-live="polite" className="text-sm font-medium text-level-stop">
        {server("token") ?? (state && !state.ok ? state.message : "")}
      </p>
      <Button type="submit" disabled={form.formState.isSubmitting} className="w-full">
        Change password
      </Button>
    </form>
  );
}
