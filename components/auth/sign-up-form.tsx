"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import { useRouter } from "next/navigation";
import type { SignUpInput } from "@/lib/validation/auth";
import { displayNameRules, emailRules, newPasswordRules } from "@/lib/validation/auth-rules";
import { Button } from "@/components/ui/button";
import { signUp, type ActionState } from "./actions";
import { TextField } from "./text-field";

export function SignUpForm({ role }: { role: "homeowner" | "reviewer" }) {
  const router = useRouter();
  const [state, setState] = useState<ActionState | null>(null);
  // The browser checks with react-hook-form's rules; the server action parses with zod.
  const form = useForm<SignUpInput>({
    defaultValues: { role, displayName: "", email: "", password: "" },
  });
  const onSubmit = async (values: SignUpInput) => {
    const r = await signUp(values);
    setState(r);
    if (!r.ok) return;
    const { signIn } = await import("next-auth/react");
    const s = await signIn("credentials", {
      email: values.email,
      password: values.password,
      redirect: false,
    });
    router.push(s?.ok ? (role === "reviewer" ? "/reviewer/profile" : "/dashboard") : "/sign-in");
    router.refresh();
  };
  const server = (k: string) => state?.fieldErrors?.[k]?.[0];
  return (
    <form
      onSubmit={form.handleSubmit(onSubmit)}
      noValidate
      className="space-y-3"
      aria-label="Sign up"
    >
      <input type="hidden" {...form.register("role")} />
      <TextField
        form={form}
        name="displayName"
        label="Your name"
        autoComplete="name"
        rules={displayNameRules}
        serverError={server("displayName")}
      />
      <TextField
        form={form}
        name="email"
        label="E-mail"
        type="email"
        autoComplete="email"
        rules={emailRules}
        serverError={server("email")}
      />
      <TextField
        form={form}
        name="password"
        label="Password"
        type="password"
        autoComplete="new-password"
        rules={newPasswordRules}
        hint="At least 10 characters, not a common password"
        serverError={server("password")}
      />
      <p aria-live="polite" className="text-sm font-medium text-level-stop">
        {state && !state.ok ? state.message : ""}
      </p>
      <Button type="submit" disabled={form.formState.isSubmitting} className="w-full">
        {form.formState.isSubmitting
          ? "Creating your account…"
          : role === "reviewer"
            ? "Create reviewer account"
            : "Create account"}
      </Button>
    </form>
  );
}
