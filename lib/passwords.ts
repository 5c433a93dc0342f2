import { dictionary } from "@zxcvbn-ts/language-common";

let list: Set<string> | undefined;

/** True for a password on the zxcvbn-ts list of ~49,000 common passwords (case-insensitive). */
export function isCommonPassword(password: string): boolean {
  list ??= new Set((dictionary["passwords-common"] as string[]).map((p) => p.toLowerCase()));
  return list.has(password.toLowerCase());
}
