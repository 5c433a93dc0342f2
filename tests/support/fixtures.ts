/**
 * Fixture builders for integration tests: each writes the rows it names straight into the test
 * database through the Knex instance it is given, and returns the ids and the actor objects, so a
 * test states what it needs instead of reading it out of the demo seed.
 *
 *   const owner = await makeHomeowner(knex);
 *   const sol = await makeReviewer(knex);                       // verified unless told otherwise
 *   const job = await makeJob(knex, "delivered", { reviewer: sol });
 *
 * Rows are plausible but minimal: the job builders write the job, its report and its dispute as
 * the transitions in lib/jobs would leave them, but no ledger entries, e-mails or audit rows.
 * Every actor is `{ id, role, ... }`, the shape the data-access functions take.
 */
import type { Knex } from "knex";
import bcrypt from "bcryptjs";
import { demoSystem } from "@/lib/calc/demo-system";
import { runLoopCheck } from "@/lib/calc/loop-check";
import { CATALOGUE_VERSION } from "@/lib/checklist/catalogue";
import { buildChecklist } from "@/lib/checklist/build";
import { REQUIRED_CREDENTIAL_KINDS } from "@/lib/credentials";
import { env } from "@/lib/env";
import {
  disputeOpenUntil,
  JOB_STATES,
  refundSplit,
  splitFee,
  TRANSITIONS,
  type JobState,
  type TransitionName,
} from "@/lib/jobs";
import { systemSchema, type System, type SystemInput } from "@/lib/validation/system";

/** Every fixture user can sign in with this password. */
export const FIXTURE_PASSWORD = "fixture-loop-2026";
// Few bcrypt rounds: these hashes guard nothing, and tests make many users.
const PASSWORD_HASH = bcrypt.hashSync(FIXTURE_PASSWORD, 4);

const DAY_MS = 86_400_000;
const HOUR_MS = 3_600_000;
/** MariaDB DATETIME(3) in UTC, the way the connection (timezone "Z") reads it back. */
export const sqlDateTime = (d: Date) => d.toISOString().slice(0, 23).replace("T", " ");
const sqlDate = (d: Date) => d.toISOString().slice(0, 10);
/** A DATETIME string read back from the test database as a Date. */
export const fromSqlDateTime = (s: string) => new Date(`${s.replace(" ", "T")}Z`);
export const daysFromNow = (days: number, now = new Date()) =>
  new Date(now.getTime() + days * DAY_MS);

let sequence = 0;
const unique = () => `${Date.now().toString(36)}${(sequence++).toString(36)}`;

// ---------------------------------------------------------------------------------------------
// People
// ---------------------------------------------------------------------------------------------

export interface HomeownerFixture {
  id: number;
  role: "homeowner";
  email: string;
  displayName: string;
}
export interface ReviewerFixture {
  id: number;
  role: "reviewer";
  email: string;
  displayName: string;
  verified: boolean;
  suspended: boolean;
}
export interface AdminFixture {
  id: number;
  role: "admin";
  email: string;
  displayName: string;
}

interface UserOptions {
  displayName?: string;
  email?: string;
  /** The address is confirmed (default true). */
  emailVerified?: boolean;
}

async function insertUser(
  knex: Knex,
  role: "homeowner" | "reviewer" | "admin",
  o: UserOptions,
): Promise<{ id: number; email: string; displayName: string }> {
  const tag = unique();
  const email = o.email ?? `${role}-${tag}@fixture.test`;
  const displayName = o.displayName ?? `Test ${role} ${tag}`;
  const [id] = await knex("users").insert({
    email,
    role,
    display_name: displayName,
    password_hash: PASSWORD_HASH,
    email_verified_at: o.emailVerified === false ? null : sqlDateTime(new Date()),
  });
  return { id: Number(id), email, displayName };
}

export async function makeHomeowner(knex: Knex, o: UserOptions = {}): Promise<HomeownerFixture> {
  return { ...(await insertUser(knex, "homeowner", o)), role: "homeowner" };
}

export async function makeAdmin(knex: Knex, o: UserOptions = {}): Promise<AdminFixture> {
  return { ...(await insertUser(knex, "admin", o)), role: "admin" };
}

export interface ReviewerOptions extends UserOptions {
  /**
   * Verified (the default): a profile and every required credential kind verified and unexpired
   * (lib/credentials.ts). Not verified: the same credentials, still pending.
   */
  verified?: boolean;
  /** Suspended by an admin (which makes the reviewer unverified whatever the credentials). */
  suspended?: boolean;
  region?: string;
  centreLat?: number;
  centreLng?: number;
  travelRadiusKm?: number;
}

export async function makeReviewer(knex: Knex, o: ReviewerOptions = {}): Promise<ReviewerFixture> {
  const verified = o.verified ?? true;
  const suspended = o.suspended ?? false;
  const user = await insertUser(knex, "reviewer", o);
  const now = new Date();
  await knex("reviewer_profiles").insert({
    user_id: user.id,
    trading_name: `${user.displayName} Heating`,
    bio: "Solar thermal and unvented cylinder work (test fixture).",
    years_in_trade: 12,
    specialisms: JSON.stringify(["flat_plate", "evacuated_tube"]),
    region: o.region ?? "south-west",
    centre_lat: o.centreLat ?? null,
    centre_lng: o.centreLng ?? null,
    travel_radius_km: o.travelRadiusKm ?? null,
    hourly_rate_minor: 6000,
    currency: env().CURRENCY,
    payment_account_id: verified ? `acct_fixture_${user.id}` : null,
    payouts_enabled: verified,
    suspended_at: suspended ? sqlDateTime(now) : null,
    suspended_reason: suspended ? "Suspended for a test." : null,
  });
  for (const kind of REQUIRED_CREDENTIAL_KINDS) {
    await knex("credentials").insert({
      reviewer_id: user.id,
      kind,
      issuer: "Test Trade Body",
      number: `FX-${user.id}-${kind.slice(0, 6)}`,
      expires_on: sqlDate(daysFromNow(365, now)),
      status: verified ? "verified" : "pending",
      reviewed_at: verified ? sqlDateTime(daysFromNow(-30, now)) : null,
    });
  }
  return { ...user, role: "reviewer", verified: verified && !suspended, suspended };
}

// ---------------------------------------------------------------------------------------------
// Projects, requests, quotes
// ---------------------------------------------------------------------------------------------

export interface ProjectFixture {
  id: number;
  ownerId: number;
  owner: HomeownerFixture;
  system: System;
}

/** A project with a complete, validated description (the example system unless one is given). */
export async function makeProject(
  knex: Knex,
  owner: HomeownerFixture,
  o: { system?: SystemInput; title?: string } = {},
): Promise<ProjectFixture> {
  const system = systemSchema.parse(structuredClone(o.system ?? demoSystem));
  const check = runLoopCheck(system);
  const [id] = await knex("projects").insert({
    owner_id: owner.id,
    title: o.title ?? `Test loop ${unique()}`,
    system: JSON.stringify(system),
    region: system.site.region,
    collector_type: system.collectors.type,
    collector_area_m2: system.collectors.count * system.collectors.apertureAreaM2Each,
    worst_level: check.worst,
    status: "ready",
  });
  return { id: Number(id), ownerId: owner.id, owner, system };
}

export type RequestKind = "remote_check" | "site_visit";
export type RequestStatus = "open" | "awarded" | "cancelled" | "expired";

export interface RequestFixture {
  id: number;
  projectId: number;
  homeownerId: number;
  homeowner: HomeownerFixture;
  kind: RequestKind;
  status: RequestStatus;
  region: string;
}

export interface RequestOptions {
  kind?: RequestKind;
  status?: RequestStatus;
  budgetMinMinor?: number;
  budgetMaxMinor?: number;
  /** Site visits only: where the site is. */
  siteLat?: number;
  siteLng?: number;
  /** When it was posted (default now). */
  createdAt?: Date;
}

/** What posting a request keeps (lib/data/projects.ts createRequest): the system and the loop check with its checklist keys. */
export function requestSnapshots(system: System) {
  const check = runLoopCheck(system);
  const list = buildChecklist(system, check.findings);
  return {
    system_snapshot: JSON.stringify(system),
    loop_check_snapshot: JSON.stringify({
      worst: check.worst,
      findings: check.findings,
      catalogueVersion: list.version,
      itemKeys: list.items.map((i) => i.key),
    }),
  };
}

/** A request on the project; an `expired` one has its expiry in the past, the others in the future. */
export async function makeRequest(
  knex: Knex,
  project: ProjectFixture,
  o: RequestOptions = {},
): Promise<RequestFixture> {
  const kind = o.kind ?? "remote_check";
  const status = o.status ?? "open";
  const created = o.createdAt ?? new Date();
  // An expired request's date has passed; any other's is REQUEST_EXPIRY_DAYS after posting
  // (and, for one still open, never already past, or the worker would expire it).
  const due = daysFromNow(env().REQUEST_EXPIRY_DAYS, created);
  const expires =
    status === "expired"
      ? daysFromNow(-1)
      : status === "open" && due.getTime() <= Date.now()
        ? daysFromNow(1)
        : due;
  const [id] = await knex("requests").insert({
    project_id: project.id,
    homeowner_id: project.ownerId,
    kind,
    status,
    questions: "Is the expansion vessel big enough for steam at this static height? (test)",
    budget_min_minor: o.budgetMinMinor ?? 6000,
    budget_max_minor: o.budgetMaxMinor ?? 15000,
    currency: env().CURRENCY,
    region: project.system.site.region,
    collector_type: project.system.collectors.type,
    site_lat: kind === "site_visit" ? (o.siteLat ?? null) : null,
    site_lng: kind === "site_visit" ? (o.siteLng ?? null) : null,
    window_start: kind === "site_visit" ? sqlDate(daysFromNow(7, created)) : null,
    window_end: kind === "site_visit" ? sqlDate(daysFromNow(28, created)) : null,
    access_notes: kind === "site_visit" ? "Loft hatch on the landing. (test)" : null,
    expires_at: sqlDateTime(expires),
    created_at: sqlDateTime(created),
    ...requestSnapshots(project.system),
  });
  return {
    id: Number(id),
    projectId: project.id,
    homeownerId: project.ownerId,
    homeowner: project.owner,
    kind,
    status,
    region: project.system.site.region,
  };
}

export type QuoteStatus = "live" | "withdrawn" | "declined" | "accepted";

export interface QuoteFixture {
  id: number;
  requestId: number;
  reviewerId: number;
  reviewer: ReviewerFixture;
  priceMinor: number;
  status: QuoteStatus;
}

export async function makeQuote(
  knex: Knex,
  request: RequestFixture,
  reviewer: ReviewerFixture,
  o: { priceMinor?: number; status?: QuoteStatus; turnaroundDays?: number } = {},
): Promise<QuoteFixture> {
  const priceMinor = o.priceMinor ?? 9500;
  const status = o.status ?? "live";
  const [id] = await knex("quotes").insert({
    request_id: request.id,
    reviewer_id: reviewer.id,
    price_minor: priceMinor,
    currency: env().CURRENCY,
    turnaround_days: o.turnaroundDays ?? 3,
    scope_md: "Full checklist review of the sketch, photos and loop check. (test)",
    proposed_visit_date: request.kind === "site_visit" ? sqlDate(daysFromNow(10)) : null,
    status,
    decline_reason: status === "declined" ? "The homeowner chose another quote." : null,
  });
  return {
    id: Number(id),
    requestId: request.id,
    reviewerId: reviewer.id,
    reviewer,
    priceMinor,
    status,
  };
}

// ---------------------------------------------------------------------------------------------
// Jobs
// ---------------------------------------------------------------------------------------------

export interface JobOptions {
  homeowner?: HomeownerFixture;
  reviewer?: ReviewerFixture;
  /** Settles disputes; made when the path needs one and none is given. */
  admin?: AdminFixture;
  project?: ProjectFixture;
  kind?: RequestKind;
  priceMinor?: number;
  /**
   * The last transition, where a state has two ways in: `released` by `release` (default) or
   * `settleRelease`; `refunded` by `cancelForRefund` (default) or `settleFullRefund`.
   */
  via?: TransitionName;
  /** When the job reached its state (default an hour ago); earlier steps are a day apart before it. */
  at?: Date;
  /** For `settlePartialRefund`: how much went back (default half the price, rounded down). */
  refundMinor?: number;
}

export interface JobFixture {
  id: number;
  state: JobState;
  amountMinor: number;
  feeMinor: number;
  /** The transitions taken from `awaiting_payment`, in order. */
  path: TransitionName[];
  homeowner: HomeownerFixture;
  reviewer: ReviewerFixture;
  admin: AdminFixture | null;
  project: ProjectFixture;
  request: RequestFixture;
  quote: QuoteFixture;
}

/** The shortest way from awaiting_payment to `target` through lib/jobs' transitions. */
function pathTo(target: JobState): TransitionName[] {
  const queue: { state: JobState; path: TransitionName[] }[] = [
    { state: "awaiting_payment", path: [] },
  ];
  const seen = new Set<JobState>(["awaiting_payment"]);
  while (queue.length) {
    const { state, path } = queue.shift()!;
    if (state === target) return path;
    for (const rule of Object.values(TRANSITIONS)) {
      if (rule.from !== state || seen.has(rule.to)) continue;
      seen.add(rule.to);
      queue.push({ state: rule.to, path: [...path, rule.name] });
    }
  }
  throw new Error(`No transitions lead to ${target}`);
}

/**
 * A job in `state`, with its project, request (awarded; cancelled for a cancelled job) and
 * accepted quote, and the timestamps, report and dispute that the path to that state leaves.
 * The fee is `splitFee(price, PLATFORM_FEE_PERCENT)`; a delivered job's `release_due_at` is
 * `disputeOpenUntil(delivered_at, DISPUTE_WINDOW_DAYS)`, so with the default `at` the dispute
 * window is still open (pass `at` more than the window ago to have it closed).
 */
export async function makeJob(
  knex: Knex,
  state: JobState,
  o: JobOptions = {},
): Promise<JobFixture> {
  if (!JOB_STATES.includes(state)) throw new Error(`Not a job state: ${state}`);
  let path: TransitionName[];
  if (o.via) {
    const last = TRANSITIONS[o.via];
    if (last.to !== state) throw new Error(`${o.via} does not lead to ${state}`);
    path = [...pathTo(last.from), o.via];
  } else {
    path = pathTo(state);
  }

  const e = env();
  const homeowner = o.project?.owner ?? o.homeowner ?? (await makeHomeowner(knex));
  const reviewer = o.reviewer ?? (await makeReviewer(knex));
  const needsAdmin = path.some((t) => t.startsWith("settle"));
  const admin = o.admin ?? (needsAdmin ? await makeAdmin(knex) : null);
  const project = o.project ?? (await makeProject(knex, homeowner));

  // The timeline: the request three days before acceptance, then a day per transition up to `at`.
  const at = o.at ?? new Date(Date.now() - HOUR_MS);
  const stepAt = (i: number) => new Date(at.getTime() - (path.length - i) * DAY_MS);
  const acceptedAt = stepAt(0);
  const request = await makeRequest(knex, project, {
    kind: o.kind,
    status: state === "cancelled" ? "cancelled" : "awarded",
    createdAt: new Date(acceptedAt.getTime() - 3 * DAY_MS),
  });
  const quote = await makeQuote(knex, request, reviewer, {
    priceMinor: o.priceMinor,
    status: "accepted",
  });
  const amountMinor = quote.priceMinor;
  // What accepting the quote writes; settling a dispute leaves the column as it was.
  const feeMinor = splitFee(amountMinor, e.PLATFORM_FEE_PERCENT).feeMinor;

  const row: Record<string, unknown> = {
    request_id: request.id,
    quote_id: quote.id,
    homeowner_id: homeowner.id,
    reviewer_id: reviewer.id,
    state,
    amount_minor: amountMinor,
    currency: e.CURRENCY,
    checkout_session_id: `cs_fixture_${unique()}`,
    fee_minor: feeMinor,
    created_at: sqlDateTime(acceptedAt),
  };
  let report: Record<string, unknown> | undefined;
  let dispute: Record<string, unknown> | undefined;
  for (const [i, t] of path.entries()) {
    const when = sqlDateTime(stepAt(i + 1));
    switch (t) {
      case "fund":
        row.funded_at = when;
        row.payment_intent_id = `pi_fixture_${unique()}`;
        break;
      case "startReview":
        row.review_started_at = when;
        report = { catalogue_version: CATALOGUE_VERSION, status: "draft", required_changes: "[]" };
        break;
      case "deliver":
        row.delivered_at = when;
        row.release_due_at = sqlDateTime(disputeOpenUntil(stepAt(i + 1), e.DISPUTE_WINDOW_DAYS));
        report = {
          ...report,
          status: "delivered",
          outcome: "fix_before_filling",
          summary_md: "Sound apart from the vessel: fit the larger size before filling. (test)",
          required_changes: JSON.stringify(["Fit an 18 L solar expansion vessel."]),
          delivered_at: when,
        };
        break;
      case "openDispute":
        dispute = {
          opened_by: homeowner.id,
          reason: "The report did not answer my question about the relief discharge. (test)",
          status: "open",
          created_at: when,
        };
        break;
      case "settleRelease":
      case "settlePartialRefund":
      case "settleFullRefund": {
        const refund =
          t === "settleRelease"
            ? 0
            : t === "settleFullRefund"
              ? amountMinor
              : (o.refundMinor ?? Math.floor(amountMinor / 2));
        // Validates the refund against the price (refundSplit throws on more than was paid).
        refundSplit(amountMinor, refund, e.PLATFORM_FEE_PERCENT);
        dispute = {
          ...dispute,
          status: "settled",
          resolution:
            t === "settleRelease"
              ? "release"
              : t === "settleFullRefund"
                ? "full_refund"
                : "partial_refund",
          refund_minor: t === "settleRelease" ? null : refund,
          settled_by: admin!.id,
          admin_note: "Settled for a test.",
          settled_at: when,
        };
        row.closed_at = when;
        break;
      }
      case "cancel":
      case "cancelForRefund":
      case "release":
        row.closed_at = when;
        break;
    }
  }

  const [id] = await knex("jobs").insert(row);
  const jobId = Number(id);
  if (report) await knex("reports").insert({ ...report, job_id: jobId });
  if (dispute) await knex("disputes").insert({ ...dispute, job_id: jobId });
  return {
    id: jobId,
    state,
    amountMinor,
    feeMinor,
    path,
    homeowner,
    reviewer,
    admin,
    project,
    request,
    quote,
  };
}
