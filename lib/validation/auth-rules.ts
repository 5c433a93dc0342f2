/**
 * The browser's checks for the small public account forms (sign-in, sign-up, forgotten and new
 * password), as react-hook-form rules: no zod here, so those pages ship without it. The limits
 * and messages are the ones `lib/validation/auth.ts` gives its zod schemas, which the server
 * actions and the sign-in handler still run; tests/unit/auth-rules.test.ts checks that both
 * give the same first message for the same input.
 */
import type { RegisterOptions } from "react-hook-form";

export const PASSWORD_MIN = 10;
export const PASSWORD_MAX = 200;
export const EMAIL_MAX = 254;
export const NAME_MIN = 2;
export const NAME_MAX = 100;
export const RESET_TOKEN = /^[A-Za-z0-9_-]{20,100}$/;

/** zod 4's own e-mail pattern (`z.regexes.email`); the zod schema is given this one. */
export const EMAIL_PATTERN =
  /^(?:[A-Za-z0-9_'+\-]+\.)*[A-Za-z0-9_'+\-]*[A-Za-z0-9_+-]@(?:[A-Za-z0-9][A-Za-z0-9\-]*\.)+[A-Za-z]{2,}$/;

export const AUTH_MESSAGES = {
  email: "Enter a valid e-mail address",
  tooLong: (n: number) => `At most ${n} characters`,
  passwordShort: `Use at least ${PASSWORD_MIN} characters`,
  passwordMissing: "Enter your password",
  name: "Enter your name",
  token: "This link is not valid",
  confirm: "The two passwords differ",
} as const;

type Rules = Pick<RegisterOptions, "validate">;

const check =
  (test: (v: string) => string | true): Rules["validate"] =>
  (v: unknown) =>
    test(typeof v === "string" ? v : "");

/** Trimmed and lower-cased as the schema does, then the pattern, then the length. */
export const emailRules: Rules = {
  validate: check((raw) => {
    const v = raw.trim().toLowerCase();
    if (!EMAIL_PATTERN.test(v)) return AUTH_MESSAGES.email;
    if (v.length > EMAIL_MAX) return AUTH_MESSAGES.tooLong(EMAIL_MAX);
    return true;
  }),
};

/** A new password (sign-up, reset). */
export const newPasswordRules: Rules = {
  validate: check((v) => {
    if (v.length < PASSWORD_MIN) return AUTH_MESSAGES.passwordShort;
    if (v.length > PASSWORD_MAX) return AUTH_MESSAGES.tooLong(PASSWORD_MAX);
    return true;
  }),
};

/** The password typed to sign in. */
export const passwordRules: Rules = {
  validate: check((v) => {
    if (v.length < 1) return AUTH_MESSAGES.passwordMissing;
    if (v.length > PASSWORD_MAX) return AUTH_MESSAGES.tooLong(PASSWORD_MAX);
    return true;
  }),
};

export const displayNameRules: Rules = {
  validate: check((raw) => {
    const v = raw.trim();
    if (v.length < NAME_MIN) return AUTH_MESSAGES.name;
    if (v.length > NAME_MAX) return AUTH_MESSAGES.tooLong(NAME_MAX);
    return true;
  }),
};

export const tokenRules: Rules = {
  validate: check((v) => RESET_TOKEN.test(v) || AUTH_MESSAGES.token),
};

/** The second password box must repeat the first (`password` in the same form). */
export const confirmRules: Rules = {
  validate: (v: unknown, all: Record<string, unknown>) =>
    v === all.password || AUTH_MESSAGES.confirm,
};
