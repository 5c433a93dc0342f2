import { createHash, randomBytes } from "node:crypto";
import { fromSqlDateTime, sqlDateTime } from "@/lib/time";
import type { Db } from "./db";

export type TokenPurpose = "verify_email" | "reset_password";
export const TOKEN_TTL_MS: Record<TokenPurpose, number> = {
  verify_email: 24 * 3_600_000,
  reset_password: 3_600_000,
};

const sha256 = (s: string) => createHash("sha256").update(s).digest("hex");

/** A new single-use token: the raw value goes in the e-mail link, only its hash is stored. */
export async function issueToken(
  trx: Db,
  userId: number,
  purpose: TokenPurpose,
  now = new Date(),
): Promise<string> {
  const raw = randomBytes(32).toString("base64url");
  await trx("auth_tokens").insert({
    user_id: userId,
    purpose,
    token_hash: sha256(raw),
    expires_at: sqlDateTime(now, TOKEN_TTL_MS[purpose]),
  });
  return raw;
}

/** Use a token once: returns its user id, or null when unknown, used or expired. */
export async function consumeToken(
  trx: Db,
  raw: string,
  purpose: TokenPurpose,
  now = new Date(),
): Promise<number | null> {
  const row = await trx("auth_tokens")
    .where({ token_hash: sha256(raw), purpose })
    .forUpdate()
    .first("id", "user_id", "expires_at", "used_at");
  if (!row || row.used_at || fromSqlDateTime(row.expires_at).getTime() < now.getTime()) return null;
  await trx("auth_tokens")
    .where({ id: row.id })
    .update({ used_at: sqlDateTime(now) });
  return Number(row.user_id);
}
