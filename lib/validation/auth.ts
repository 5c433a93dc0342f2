import { z } from "@/lib/zod";

export const PASSWORD_MIN = 10;

const email = z
  .string()
  .trim()
  .toLowerCase()
  .pipe(z.email({ error: "Enter a valid e-mail address" }).max(254, "At most 254 characters"));
const password = z
  .string()
  .min(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters`)
  .max(200, "At most 200 characters");

export const signUpSchema = z.object({
  role: z.enum(["homeowner", "reviewer"], { error: "Choose homeowner or reviewer" }),
  displayName: z.string().trim().min(2, "Enter your name").max(100, "At most 100 characters"),
  email,
  password,
});
export type SignUpInput = z.input<typeof signUpSchema>;

export const signInSchema = z.object({
  email,
  password: z.string().min(1, "Enter your password").max(200),
});
export type SignInInput = z.input<typeof signInSchema>;

export const forgotPasswordSchema = z.object({ email });
export type ForgotPasswordInput = z.input<typeof forgotPasswordSchema>;

export const resetPasswordSchema = z
  .object({
    token: z.string().regex(/^[A-Za-z0-9_-]{20,100}$/, "This link is not valid"),
    password,
    confirm: z.string(),
  })
  .refine((v) => v.password === v.confirm, {
    path: ["confirm"],
    message: "The two passwords differ",
  });
export type ResetPasswordInput = z.input<typeof resetPasswordSchema>;

export const notificationPreferencesSchema = z.object({
  notifyNewMessage: z.boolean(),
  notifyNewQuote: z.boolean(),
});
export type NotificationPreferencesInput = z.input<typeof notificationPreferencesSchema>;
