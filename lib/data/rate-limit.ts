import { RateLimiterMySQL, RateLimiterRes } from "rate-limiter-flexible";
import type { Db } from "./db";
import { HttpError } from "./errors";
import { enqueueEmail } from "./outbox";

/**
 * Rate limits with `rate-limiter-flexible`, its counters in MariaDB (`rate_limits`, through the
 * Knex pool) so every app process shares them.
 *
 * Sign-in follows the library's login-protection pattern and counts failures only (a correct
 * password never uses anything up, and clears the account-and-address counter):
 * - consecutive failures per account AND address: after `perPair` the pair waits, and each
 *   further round waits twice as long (backoff). A stranger's failures from another address
 *   never block the real user's address;
 * - failures per address per day, against one address spraying many accounts;
 * - failures per account per day from anywhere: never blocking (that would hand attackers a
 *   lock-out), but the account holder gets an e-mail once the count is reached.
 * Sign-ups and password-reset e-mails are limited per address and per target account.
 */
export const SIGN_IN_LIMITS = {
  perPair: 5,
  pairWindowS: 3600,
  firstBackoffS: 60,
  maxBackoffS: 3600,
  perAddressPerDay: 100,
  alertAfterAccountFailures: 10,
} as const;

export const SIGN_UP_LIMITS = { perAddressPerHour: 10, perAccountPerDay: 3 } as const;
export const RESET_LIMITS = { perAddressPerHour: 10, perAccountPerHour: 3 } as const;

type Limiter = RateLimiterMySQL;
type LimiterSet = Record<
  | "pair"
  | "pairRounds"
  | "address"
  | "account"
  | "signUpAddress"
  | "signUpAccount"
  | "resetAddress"
  | "resetAccount",
  Limiter
>;

const sets = new WeakMap<Db, LimiterSet>();

function limiters(db: Db): LimiterSet {
  let set = sets.get(db);
  if (set) return set;
  const dbName = (db.client.config.connection as { database: string }).database;
  const make = (keyPrefix: string, points: number, duration: number) =>
    new RateLimiterMySQL({
      storeClient: db,
      storeType: "knex",
      dbName,
      tableName: "rate_limits",
      // The table comes from the migrations (db/migrations/20261202_0020_rate_limits.ts).
      tableCreated: true,
      keyPrefix,
      points,
      duration,
    });
  const L = SIGN_IN_LIMITS;
  set = {
    pair: make("signin_pair", L.perPair, L.pairWindowS),
    // How many times the pair has been made to wait today: the next wait doubles.
    pairRounds: make("signin_rounds", 1000, 86_400),
    address: make("signin_addr", L.perAddressPerDay, 86_400),
    account: make("signin_acct", 1_000_000, 86_400),
    signUpAddress: make("signup_addr", SIGN_UP_LIMITS.perAddressPerHour, 3600),
    signUpAccount: make("signup_acct", SIGN_UP_LIMITS.perAccountPerDay, 86_400),
    resetAddress: make("reset_addr", RESET_LIMITS.perAddressPerHour, 3600),
    resetAccount: make("reset_acct", RESET_LIMITS.perAccountPerHour, 3600),
  };
  sets.set(db, set);
  return set;
}

// Keys fit `rate_limits.key` (255): the longest prefix (14) + e-mail (180) + "|" + address (60).
const normEmail = (email: string) => email.trim().toLowerCase().slice(0, 180);
const normAddress = (address: string) => address.slice(0, 60);
const pairKey = (email: string, address: string) => `${normEmail(email)}|${normAddress(address)}`;

/** Seconds until a rejected counter allows again (at least 1). */
const waitS = (res: RateLimiterRes) => Math.max(1, Math.ceil(res.msBeforeNext / 1000));

/** Before checking a password: how long this account-and-address pair must still wait (0 = go). */
export async function signInWait(db: Db, email: string, address: string): Promise<number> {
  const l = limiters(db);
  const [pair, addr] = await Promise.all([
    l.pair.get(pairKey(email, address)),
    l.address.get(normAddress(address)),
  ]);
  let wait = 0;
  if (pair && pair.consumedPoints > SIGN_IN_LIMITS.perPair) wait = waitS(pair);
  if (addr && addr.consumedPoints >= SIGN_IN_LIMITS.perAddressPerDay)
    wait = Math.max(wait, waitS(addr));
  return wait;
}

/** A correct password: the pair's consecutive failures start again from nothing. */
export async function recordSignInSuccess(db: Db, email: string, address: string) {
  const l = limiters(db);
  await Promise.all([
    l.pair.delete(pairKey(email, address)),
    l.pairRounds.delete(pairKey(email, address)),
  ]);
}

/**
 * A wrong password (or unknown address). Counts the failure everywhere; when the pair reaches
 * its limit it is made to wait, twice as long each round; when the account's failures from
 * anywhere reach the alert count, its holder gets one e-mail (at most one a day).
 */
export async function recordSignInFailure(
  db: Db,
  email: string,
  address: string,
  appUrl: string,
): Promise<void> {
  const l = limiters(db);
  const key = pairKey(email, address);
  const overLimit = (p: Promise<RateLimiterRes>) =>
    p.then(
      () => null,
      (r: unknown) => {
        if (r instanceof RateLimiterRes) return r;
        throw r;
      },
    );
  const [pairOver, , account] = await Promise.all([
    overLimit(l.pair.consume(key)),
    overLimit(l.address.consume(normAddress(address))),
    l.account.consume(normEmail(email)),
  ]);
  if (pairOver) {
    const rounds = await l.pairRounds.consume(key);
    const wait = Math.min(
      SIGN_IN_LIMITS.firstBackoffS * 2 ** (rounds.consumedPoints - 1),
      SIGN_IN_LIMITS.maxBackoffS,
    );
    await l.pair.block(key, wait);
  }
  if (account.consumedPoints >= SIGN_IN_LIMITS.alertAfterAccountFailures) {
    await alertAccountHolder(db, normEmail(email), appUrl);
  }
}

async function alertAccountHolder(db: Db, email: string, appUrl: string) {
  const user = await db("users").where({ email }).first("id", "email", "display_name");
  if (!user) return;
  await enqueueEmail(db, {
    to: { address: user.email, userId: Number(user.id) },
    template: "sign_in_failures",
    payload: {
      name: user.display_name,
      count: SIGN_IN_LIMITS.alertAfterAccountFailures,
      url: `${appUrl}/forgot-password`,
    },
    dedupeKey: `signin-failures-${user.id}-${new Date().toISOString().slice(0, 10)}`,
  });
}

async function take(limiter: Limiter, key: string, message: string): Promise<void> {
  try {
    await limiter.consume(key);
  } catch (r) {
    if (r instanceof RateLimiterRes)
      throw new HttpError(429, `${message} Try again in ${Math.ceil(waitS(r) / 60)} minutes.`);
    throw r;
  }
}

/** A sign-up from this address for this e-mail: 429 over either limit. */
export async function limitSignUp(db: Db, address: string, email: string): Promise<void> {
  const l = limiters(db);
  await take(l.signUpAddress, normAddress(address), "Too many new accounts from this network.");
  await take(l.signUpAccount, normEmail(email), "Too many sign-ups for this e-mail address.");
}

/** A password-reset e-mail from this address to this account: 429 over either limit. */
export async function limitPasswordReset(db: Db, address: string, email: string): Promise<void> {
  const l = limiters(db);
  await take(l.resetAddress, normAddress(address), "Too many reset requests from this network.");
  await take(l.resetAccount, normEmail(email), "Too many reset e-mails for this address.");
}
