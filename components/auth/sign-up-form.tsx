"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { signUpSchema, type SignUpInput } from "@/lib/validation/auth";
import { Button } from "@/components/ui/button";
import { signUp, type ActionState } from "./actions";
import { TextField } from "./text-field";

export function SignUpForm({ role }: { role: "homeowner" | "reviewer" }) {
  const router = useRouter();
  const [state, setState] = useState<ActionState | null>(null);
  const form = useForm<SignUpInput>({
    resolver: zodResolver(signUpSchema),
    defaultValues: { role, displayName: "", email: "", password: "" },
  });
  const onSubmit = async (values: SignUpInput) => {
    const r = await signUp(values);
    setState(r);
    if (!r.ok) return;
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
        serverError={server("displayName")}
      />
      <TextField
        form={form}
        name="email"
        label="E-mail"
        type="email"
        autoComplete="email"
        serverError={server("email")}
      />
      <TextField
        form={form}
        name="password"
        label="Password"
        type="password"
        autoComplete="new-password"
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
