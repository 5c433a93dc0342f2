"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import Link from "next/link";
import {
  forgotPasswordSchema,
  resetPasswordSchema,
  type ForgotPasswordInput,
  type ResetPasswordInput,
} from "@/lib/validation/auth";
import { Button } from "@/components/ui/button";
import { chooseNewPassword, requestReset, type ActionState } from "./actions";
import { TextField } from "./text-field";

export function ForgotPasswordForm() {
  const [state, setState] = useState<ActionState | null>(null);
  const form = useForm<ForgotPasswordInput>({
    resolver: zodResolver(forgotPasswordSchema),
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
    resolver: zodResolver(resetPasswordSchema),
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
      <input type="hidden" {...form.register("token")} />
      <TextField
        form={form}
        name="password"
        label="New password"
        type="password"
        autoComplete="new-password"
        serverError={server("password")}
      />
      <TextField
        form={form}
        name="confirm"
        label="New password again"
        type="password"
        autoComplete="new-password"
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
