import { z } from "@/lib/zod";
import {
  AUTH_MESSAGES as M,
  EMAIL_MAX,
  EMAIL_PATTERN,
  NAME_MAX,
  NAME_MIN,
  PASSWORD_MAX,
  PASSWORD_MIN,
  RESET_TOKEN,
} from "./auth-rules";

// The limits and words are shared with the browser's rules (./auth-rules), which carry no zod.
export { PASSWORD_MIN };

const email = z
  .string()
  .trim()
  .toLowerCase()
  .pipe(z.email({ pattern: EMAIL_PATTERN, error: M.email }).max(EMAIL_MAX, M.tooLong(EMAIL_MAX)));
const password = z
  .string()
  .min(PASSWORD_MIN, M.passwordShort)
  .max(PASSWORD_MAX, M.tooLong(PASSWORD_MAX));

export const signUpSchema = z.object({
  role: z.enum(["homeowner", "reviewer"], { error: "Choose homeowner or reviewer" }),
  displayName: z.string().trim().min(NAME_MIN, M.name).max(NAME_MAX, M.tooLong(NAME_MAX)),
  email,
  password,
});
export type SignUpInput = z.input<typeof signUpSchema>;

export const signInSchema = z.object({
  email,
  password: z.string().min(1, M.passwordMissing).max(PASSWORD_MAX, M.tooLong(PASSWORD_MAX)),
});
export type SignInInput = z.input<typeof signInSchema>;

export const forgotPasswordSchema = z.object({ email });
export type ForgotPasswordInput = z.input<typeof forgotPasswordSchema>;

export const resetPasswordSchema = z
  .object({
    token: z.string().regex(RESET_TOKEN, M.token),
    password,
    confirm: z.string(),
  })
  .refine((v) => v.password === v.confirm, {
    path: ["confirm"],
    message: M.confirm,
  });
export type ResetPasswordInput = z.input<typeof resetPasswordSchema>;

export const notificationPreferencesSchema = z.object({
  notifyNewMessage: z.boolean(),
  notifyNewQuote: z.boolean(),
});
export type NotificationPreferencesInput = z.input<typeof notificationPreferencesSchema>;
