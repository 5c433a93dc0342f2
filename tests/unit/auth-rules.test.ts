import { describe, expect, it } from "vitest";
import { z } from "zod";
import type { z as Z } from "zod";
import {
  confirmRules,
  displayNameRules,
  EMAIL_PATTERN,
  emailRules,
  newPasswordRules,
  passwordRules,
  tokenRules,
} from "@/lib/validation/auth-rules";
import {
  resetPasswordSchema,
  signInSchema,
  signUpSchema,
  forgotPasswordSchema,
} from "@/lib/validation/auth";

type Validate = (v: unknown, all: Record<string, unknown>) => string | boolean;

/** What react-hook-form shows for a field: the rule's message, or nothing. */
function ruleMessage(rules: { validate?: unknown }, value: string, all = {}): string | null {
  const r = (rules.validate as Validate)(value, all);
  return r === true ? null : (r as string);
}

/** What the server's zod schema says first about `field` (what the field showed before). */
function zodMessage(schema: Z.ZodType, input: object, field: string): string | null {
  const r = schema.safeParse(input);
  if (r.success) return null;
  return r.error.issues.find((i) => i.path.join(".") === field)?.message ?? null;
}

const long = (n: number) => "a".repeat(n);
const EMAILS = [
  "",
  " ",
  "ann@example.org",
  "  Ann.Smith@Example.ORG  ",
  "ann@",
  "@example.org",
  "ann@example",
  "ann example@example.org",
  "ann..smith@example.org",
  "o'neill+solar@mail.example.co.uk",
  "ann@-example.org",
  `${long(250)}@example.org`,
  `${long(240)}@example.org`,
];

describe("the browser's account-form rules say what the server's zod schemas say", () => {
  it("uses zod's own e-mail pattern (z.regexes.email)", () => {
    expect(EMAIL_PATTERN.source).toBe(z.regexes.email.source);
  });

  it.each(EMAILS)("e-mail %j", (email) => {
    const base = { email, password: "x" };
    expect(ruleMessage(emailRules, email)).toBe(zodMessage(signInSchema, base, "email"));
    expect(ruleMessage(emailRules, email)).toBe(
      zodMessage(forgotPasswordSchema, { email }, "email"),
    );
  });

  it.each(["", "x", long(200), long(201)])("sign-in password of %#", (password) => {
    expect(ruleMessage(passwordRules, password)).toBe(
      zodMessage(signInSchema, { email: "a@b.org", password }, "password"),
    );
  });

  it.each(["", long(9), long(10), long(200), long(201)])("new password of %#", (password) => {
    const input = { role: "homeowner", displayName: "Ann", email: "a@b.org", password };
    expect(ruleMessage(newPasswordRules, password)).toBe(
      zodMessage(signUpSchema, input, "password"),
    );
  });

  it.each(["", " a ", "Al", "  Al  ", long(100), long(101)])("display name %j", (displayName) => {
    const input = { role: "homeowner", displayName, email: "a@b.org", password: long(12) };
    expect(ruleMessage(displayNameRules, displayName)).toBe(
      zodMessage(signUpSchema, input, "displayName"),
    );
  });

  it.each([
    ["tok_" + long(20), long(12), long(12)],
    ["short", long(12), long(12)],
    ["tok_" + long(20), long(12), long(11)],
    ["tok_" + long(20) + "!", long(12), ""],
  ])("reset form token %j, confirm", (token, password, confirm) => {
    const input = { token, password, confirm };
    expect(ruleMessage(tokenRules, token)).toBe(zodMessage(resetPasswordSchema, input, "token"));
    expect(ruleMessage(confirmRules, confirm, input)).toBe(
      zodMessage(resetPasswordSchema, input, "confirm"),
    );
  });

  it("refuses what it should, so the checks are not empty", () => {
    expect(ruleMessage(emailRules, "ann@")).toBe("Enter a valid e-mail address");
    expect(ruleMessage(newPasswordRules, "short")).toBe("Use at least 10 characters");
    expect(ruleMessage(confirmRules, "b", { password: "a" })).toBe("The two passwords differ");
  });
});
