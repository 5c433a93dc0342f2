/**
 * The access matrix: who may open every page, call every route handler and run every server
 * action, and what everyone else gets. tests/e2e/access-matrix.test.ts reads the list of pages,
 * routes and actions from the code (tests/support/app-surface.ts) and fails for any entry without
 * a row here, so a new page, method or action needs one line. Most rows are a preset:
 *
 *   "/jobs/[id]/review": page(JOB_PARTIES, { id: "job" }),
 *   "/api/jobs/[id]/draft": { PUT: route(JOB_PARTIES_JSON, { id: "job" }, { body: {...} }) },
 *   "components/review/actions.ts#saveAnswer": action(JOB_REVIEWER_ONLY, ({ w }) => [...]),
 *
 * `params` names the world's record for each `[param]` (see tests/support/access-world.ts:
 * job, jobProject, project, openRequest, jobRequest, file, credential, jobReviewer, step).
 */
import type { Knex } from "knex";
import type { Method } from "../support/app-surface";
import { ACTORS, storeFile, type Actor, type World } from "../support/access-world";
import { form } from "../support/actions-http";
import { saveFirstFill } from "@/lib/data/first-fill";
import {
  makeJob,
  makeProject,
  makeQuote,
  makeRequest,
  makeReviewer,
  type HomeownerFixture,
} from "../support/fixtures";

// ---------------------------------------------------------------------------------------------
// Outcomes
// ---------------------------------------------------------------------------------------------

/** A page: a status, the sign-in redirect, or a status with words the page must show. */
export type PageOutcome = 200 | 403 | 404 | "signin" | { status: 200; shows: string };
/** An action: sent to sign-in, refused with a message and nothing changed, or done. */
export type ActionOutcome = "signin" | "refused" | "ok";

export type Expect<T> = Record<Actor, T>;

/** Build an expectation: `everyone` for all actors, then the exceptions. */
export function rule<T>(everyone: T, except: Partial<Expect<T>> = {}): Expect<T> {
  return Object.fromEntries(ACTORS.map((a) => [a, except[a] ?? everyone])) as Expect<T>;
}
const HOMEOWNERS = { owner: 1, otherHomeowner: 1 } as const;
const REVIEWERS = {
  pendingReviewer: 1,
  verifiedReviewer: 1,
  jobReviewer: 1,
  suspendedReviewer: 1,
} as const;
const only = <T>(who: Record<string, 1>, yes: T, no: T, anon: T) =>
  rule<T>(no, {
    anonymous: anon,
    ...Object.fromEntries(Object.keys(who).map((k) => [k, yes])),
  } as Partial<Expect<T>>);

// Page presets
export const PUBLIC_PAGE = rule<PageOutcome>(200);
export const SIGNED_IN_PAGE = rule<PageOutcome>(200, { anonymous: "signin" });
export const ADMIN_PAGE = only<PageOutcome>({ admin: 1 }, 200, 403, "signin");
export const HOMEOWNER_PAGE = only<PageOutcome>(HOMEOWNERS, 200, 403, "signin");
export const REVIEWER_PAGE = only<PageOutcome>(REVIEWERS, 200, 403, "signin");
/** Job pages: the job's homeowner, the job's reviewer and admins; anyone else is told "not found". */
export const JOB_PARTIES = rule<PageOutcome>(404, {
  anonymous: "signin",
  owner: 200,
  jobReviewer: 200,
  admin: 200,
});

// Route presets (JSON statuses)
export const JOB_PARTIES_JSON = rule<number>(404, {
  anonymous: 401,
  owner: 200,
  jobReviewer: 200,
  admin: 200,
});

// Action presets
export const HOMEOWNER_OWNER_ONLY = rule<ActionOutcome>("refused", {
  anonymous: "signin",
  owner: "ok",
});
export const ADMIN_ONLY = rule<ActionOutcome>("refused", { anonymous: "signin", admin: "ok" });
export const ANY_SIGNED_IN = rule<ActionOutcome>("ok", { anonymous: "signin" });
export const ANYONE = rule<ActionOutcome>("ok");

// ---------------------------------------------------------------------------------------------
// Rows
// ---------------------------------------------------------------------------------------------

export interface PageRow {
  params?: Record<string, string>;
  expect: Expect<PageOutcome>;
}
const page = (expect: Expect<PageOutcome>, params?: Record<string, string>): PageRow => ({
  expect,
  params,
});

export interface RouteCase {
  params?: Record<string, string>;
  /** Extra path after the pattern (catch-all routes) and the query string. */
  suffix?: string | ((w: World, actor: Actor) => string);
  body?: unknown;
  expect: Expect<number>;
}
export type RouteRow = Partial<Record<Method, RouteCase | "not-matrixed">> & {
  /** Why the route is exempt from the actor matrix (it is tested elsewhere). */
  note?: string;
};
const route = (
  expect: Expect<number>,
  params?: Record<string, string>,
  extra: Omit<RouteCase, "expect" | "params"> = {},
): RouteCase => ({ expect, params, ...extra });

export interface ActionCtx {
  knex: Knex;
  w: World;
  actor: Actor;
}
export interface ActionRow {
  /** The page (pattern) the form lives on; the request goes there. */
  page: string;
  params?: Record<string, string>;
  /** The argument list, built fresh for each actor (so one actor's success never blocks the next). */
  args: (ctx: ActionCtx) => Promise<unknown[]> | unknown[];
  expect: Expect<ActionOutcome>;
}
const action = (
  page: string,
  expect: Expect<ActionOutcome>,
  args: ActionRow["args"],
  params?: Record<string, string>,
): ActionRow => ({ page, expect, args, params });

/** A fresh job of the world's owner and job reviewer in a state. */
const jobIn = (ctx: ActionCtx, state: Parameters<typeof makeJob>[1]) =>
  makeJob(ctx.knex, state, { homeowner: ctx.w.people.owner, reviewer: ctx.w.people.jobReviewer });
/** A fresh open request of the world's owner, with a live quote of the job's reviewer. */
async function quotedRequest(ctx: ActionCtx, owner: HomeownerFixture = ctx.w.people.owner) {
  const project = await makeProject(ctx.knex, owner);
  const request = await makeRequest(ctx.knex, project);
  const quote = await makeQuote(ctx.knex, request, ctx.w.people.jobReviewer);
  return { project, request, quote };
}
const prev = { ok: false };
const REVIEWER_OK: Partial<Expect<ActionOutcome>> = {
  pendingReviewer: "ok",
  verifiedReviewer: "ok",
  jobReviewer: "ok",
  suspendedReviewer: "ok",
};

export const PAGES: Record<string, PageRow> = {
  "/": page(PUBLIC_PAGE),
  "/loop-check": page(PUBLIC_PAGE),
  "/sign-in": page(PUBLIC_PAGE),
  "/sign-up": page(PUBLIC_PAGE),
  "/forgot-password": page(PUBLIC_PAGE),
  "/reset-password": page(PUBLIC_PAGE),
  "/verify-email": page(PUBLIC_PAGE),
  "/reviewers/[id]": page(PUBLIC_PAGE, { id: "jobReviewer" }),
  // Any address no page answers: the not-found page, for everyone.
  "/[...missing]": page(rule<PageOutcome>(404), { missing: "no-such-page" }),
  "/dashboard": page(SIGNED_IN_PAGE),
  "/settings/notifications": page(SIGNED_IN_PAGE),
  "/projects/new": page(HOMEOWNER_PAGE),
  "/projects/[id]": page(
    rule<PageOutcome>(403, { anonymous: "signin", owner: 200, otherHomeowner: 404, admin: 200 }),
    { id: "project" },
  ),
  "/projects/[id]/edit/[step]": page(
    rule<PageOutcome>(403, { anonymous: "signin", owner: 200, otherHomeowner: 404 }),
    { id: "project", step: "step" },
  ),
  "/requests/[id]": page(
    rule<PageOutcome>(404, {
      anonymous: "signin",
      owner: 200,
      verifiedReviewer: 200,
      jobReviewer: 200,
      admin: 403,
    }),
    { id: "openRequest" },
  ),
  "/board": page(only<PageOutcome>(REVIEWERS, 200, 403, "signin") as Expect<PageOutcome>),
  "/reviewer/profile": page(REVIEWER_PAGE),
  "/reviewer/credentials": page(REVIEWER_PAGE),
  "/reviewer/earnings": page(REVIEWER_PAGE),
  "/jobs/[id]": page(JOB_PARTIES, { id: "job" }),
  // The workspace is the job's reviewer's; admins may read it; anyone else is refused.
  "/jobs/[id]/review": page(
    rule<PageOutcome>(403, { anonymous: "signin", jobReviewer: 200, admin: 200 }),
    { id: "job" },
  ),
  // The world's job is still in review: there is no report to read yet, for anyone (who reads a
  // delivered one: tests/integration/review.test.ts and tests/e2e/review.test.ts).
  "/jobs/[id]/report": page(rule<PageOutcome>(404, { anonymous: "signin" }), { id: "job" }),
  // Receipts are the paying homeowner's and the admins'.
  "/jobs/[id]/receipts": page(
    rule<PageOutcome>(404, { anonymous: "signin", owner: 200, admin: 200 }),
    {
      id: "job",
    },
  ),
  // The world's job has no ledger entry with this id: nobody may see a receipt that is not theirs
  // (the paying homeowner's own receipts: tests/integration/payments-receipts.test.ts).
  "/jobs/[id]/receipts/[entryId]": page(rule<PageOutcome>(404, { anonymous: "signin" }), {
    id: "job",
    entryId: "job",
  }),
  "/projects/[id]/first-fill": page(
    rule<PageOutcome>(404, { anonymous: "signin", owner: 200, jobReviewer: 200, admin: 200 }),
    { id: "jobProject" },
  ),
  "/admin/credentials": page(ADMIN_PAGE),
  "/admin/disputes": page(ADMIN_PAGE),
  "/admin/ledger": page(ADMIN_PAGE),
  "/admin/outbox": page(ADMIN_PAGE),
  "/admin/reviewers/[id]": page(ADMIN_PAGE, { id: "jobReviewer" }),
};
// The board is open to reviewers, but only a verified one sees requests.
PAGES["/board"]!.expect.pendingReviewer = { status: 200, shows: "not open to you yet" };
PAGES["/board"]!.expect.suspendedReviewer = { status: 200, shows: "not open to you yet" };

export const ROUTES: Record<string, RouteRow> = {
  "/api/health": { GET: route(rule(200)) },
  // Only there when the bench runs the app with BENCH=1.
  "/api/bench/constant": { GET: route(rule(404)) },
  // The packaged town list for the site-visit picker: public data.
  "/api/towns": { GET: route(rule(200), {}, { suffix: "?q=Ba" }) },
  "/api/jobs/[id]/review": {
    GET: route(rule(403, { anonymous: 401, jobReviewer: 200, admin: 200 }), { id: "job" }),
  },
  "/api/jobs/[id]/answers/[itemKey]": {
    PUT: "not-matrixed",
    note: "versioned autosave: 401/403/404/409/422 per actor in tests/integration/review.test.ts and tests/e2e/review.test.ts",
  },
  "/api/jobs/[id]/report-draft": {
    PUT: "not-matrixed",
    note: "versioned autosave: tests/integration/review.test.ts and tests/e2e/review.test.ts",
  },
  "/api/jobs/[id]/deliver": {
    POST: "not-matrixed",
    note: "delivery and its refusals: tests/integration/review.test.ts, tests/e2e/review.test.ts",
  },
  "/api/jobs/[id]/item-requests": {
    POST: "not-matrixed",
    note: "questions to the homeowner: tests/integration/review.test.ts (the round trip and who may ask)",
  },
  "/api/auth/[...nextauth]": {
    // next-auth's own endpoints: the session read is public; signing in is tested in access.test.ts.
    GET: route(rule(200), { nextauth: "session" }),
    POST: "not-matrixed",
    note: "POST is next-auth's sign-in and sign-out (tests/e2e/access.test.ts, session.ts)",
  },
  "/api/board": {
    GET: route(rule(403, { anonymous: 401, verifiedReviewer: 200, jobReviewer: 200 })),
  },
  "/api/credentials/[id]": {
    GET: route(rule(403, { anonymous: 401, pendingReviewer: 200, admin: 200 }), {
      id: "credential",
    }),
  },
  "/api/files/[id]": {
    GET: route(rule(403, { anonymous: 401, owner: 200, jobReviewer: 200, admin: 200 }), {
      id: "file",
    }),
  },
  // Everyone names the job reviewer's thread: a reviewer only ever reaches their own.
  "/api/requests/[id]/messages": {
    GET: route(
      rule(403, {
        anonymous: 401,
        owner: 200,
        otherHomeowner: 404,
        jobReviewer: 200,
        // Admins read every thread (they settle disputes); they cannot post.
        admin: 200,
      }),
      { id: "openRequest" },
      { suffix: (w) => `?reviewer=${w.people.jobReviewer.id}` },
    ),
    POST: route(
      rule(403, {
        anonymous: 401,
        owner: 201,
        otherHomeowner: 404,
        jobReviewer: 201,
      }),
      { id: "openRequest" },
      {
        suffix: (w) => `?reviewer=${w.people.jobReviewer.id}`,
        body: { body: "Is the vessel pre-charged? (matrix)" },
      },
    ),
  },
  "/api/uploadthing": {
    GET: "not-matrixed",
    POST: "not-matrixed",
    note: "the upload service's protocol; who may upload is tested in tests/e2e/uploads.test.ts",
  },
  "/api/webhooks/payments": {
    // A session never makes an unsigned event count.
    POST: route(rule(400), undefined, { body: { type: "checkout.session.completed" } }),
  },
};

export const ACTIONS: Record<string, ActionRow> = {
  // Accounts: for people who are not signed in; anyone may call them.
  "components/auth/actions.ts#signUp": action("/sign-up", ANYONE, ({ actor }) => [
    {
      role: "homeowner",
      displayName: `Matrix ${actor}`,
      email: `matrix-${actor}-${Date.now()}@fixture.test`,
      password: "a long matrix passphrase 2026",
    },
  ]),
  // One address per actor: resets are limited per target account (RESET_LIMITS).
  "components/auth/actions.ts#requestReset": action("/forgot-password", ANYONE, ({ actor }) => [
    { email: `nobody-${actor}@fixture.test` },
  ]),
  "components/auth/actions.ts#chooseNewPassword": action(
    "/reset-password",
    rule<ActionOutcome>("refused"),
    () => [{ token: "not-a-real-token", password: "x".repeat(20), confirm: "x".repeat(20) }],
  ),
  // A made-up token: everyone is sent back to the page's "link did not work" state.
  "components/auth/actions.ts#confirmEmail": action("/verify-email", ANYONE, () => [
    form({ token: "not-a-real-token" }),
  ]),
  "components/auth/actions.ts#resendConfirmation": action("/dashboard", ANY_SIGNED_IN, () => [
    prev,
    form({}),
  ]),
  "components/settings/actions.ts#saveNotificationSettings": action(
    "/settings/notifications",
    ANY_SIGNED_IN,
    () => [prev, form({ notifyNewMessage: "on" })],
  ),

  // Projects and requests: the owning homeowner only.
  "components/projects/actions.ts#startProject": action(
    "/projects/new",
    rule<ActionOutcome>("refused", { anonymous: "signin", owner: "ok", otherHomeowner: "ok" }),
    () => [prev, form({ title: "Matrix loop" })],
  ),
  "components/projects/actions.ts#saveStep": action(
    "/projects/[id]/edit/[step]",
    HOMEOWNER_OWNER_ONLY,
    async (ctx) => {
      const p = await makeProject(ctx.knex, ctx.w.people.owner);
      return [p.id, "site", p.system.site];
    },
    { id: "project", step: "step" },
  ),
  "components/projects/actions.ts#postRequest": action(
    "/projects/[id]",
    HOMEOWNER_OWNER_ONLY,
    async (ctx) => {
      const p = await makeProject(ctx.knex, ctx.w.people.owner);
      return [
        p.id,
        prev,
        form({
          kind: "remote_check",
          questions: "Is the vessel big enough? (matrix)",
          budgetMinPounds: "60",
          budgetMaxPounds: "150",
        }),
      ];
    },
    { id: "project" },
  ),
  "components/projects/actions.ts#editRequest": action(
    "/projects/[id]",
    HOMEOWNER_OWNER_ONLY,
    async (ctx) => {
      const p = await makeProject(ctx.knex, ctx.w.people.owner);
      const r = await makeRequest(ctx.knex, p);
      return [
        p.id,
        r.id,
        prev,
        form({
          kind: "remote_check",
          questions: "Is the vessel big enough now? (matrix)",
          budgetMinPounds: "60",
          budgetMaxPounds: "160",
        }),
      ];
    },
    { id: "project" },
  ),
  "components/projects/actions.ts#withdrawRequest": action(
    "/projects/[id]",
    HOMEOWNER_OWNER_ONLY,
    async (ctx) => {
      const p = await makeProject(ctx.knex, ctx.w.people.owner);
      const r = await makeRequest(ctx.knex, p);
      return [prev, form({ projectId: String(p.id), requestId: String(r.id) })];
    },
    { id: "project" },
  ),
  "components/projects/actions.ts#deleteFile": action(
    "/projects/[id]",
    HOMEOWNER_OWNER_ONLY,
    async (ctx) => {
      const p = await makeProject(ctx.knex, ctx.w.people.owner);
      const id = await storeFile(ctx.knex, p, ctx.w.uploadDir);
      return [prev, form({ projectId: String(p.id), attachmentId: String(id) })];
    },
    { id: "project" },
  ),
  "components/projects/actions.ts#removeProject": action(
    "/projects/[id]",
    HOMEOWNER_OWNER_ONLY,
    async (ctx) => {
      const p = await makeProject(ctx.knex, ctx.w.people.owner);
      return [prev, form({ projectId: String(p.id) })];
    },
    { id: "project" },
  ),

  // Quotes
  "components/quotes/actions.ts#sendQuote": action(
    "/requests/[id]",
    rule<ActionOutcome>("refused", {
      anonymous: "signin",
      verifiedReviewer: "ok",
      jobReviewer: "ok",
    }),
    async (ctx) => {
      const p = await makeProject(ctx.knex, ctx.w.people.owner);
      const r = await makeRequest(ctx.knex, p);
      return [
        r.id,
        prev,
        form({
          pricePounds: "95",
          turnaroundDays: "3",
          scopeMd: "Full checklist review of the loop (matrix).",
        }),
      ];
    },
    { id: "openRequest" },
  ),
  "components/quotes/actions.ts#takeBackQuote": action(
    "/requests/[id]",
    rule<ActionOutcome>("refused", { anonymous: "signin", jobReviewer: "ok" }),
    async (ctx) => {
      const { request, quote } = await quotedRequest(ctx);
      return [prev, form({ requestId: String(request.id), quoteId: String(quote.id) })];
    },
    { id: "openRequest" },
  ),
  "components/quotes/actions.ts#acceptQuoteAction": action(
    "/requests/[id]",
    HOMEOWNER_OWNER_ONLY,
    async (ctx) => {
      const { request, quote } = await quotedRequest(ctx);
      return [prev, form({ requestId: String(request.id), quoteId: String(quote.id) })];
    },
    { id: "openRequest" },
  ),
  "components/quotes/actions.ts#declineQuoteAction": action(
    "/requests/[id]",
    HOMEOWNER_OWNER_ONLY,
    async (ctx) => {
      const { request, quote } = await quotedRequest(ctx);
      return [
        prev,
        form({ requestId: String(request.id), quoteId: String(quote.id), reason: "matrix" }),
      ];
    },
    { id: "openRequest" },
  ),

  // Jobs
  "components/jobs/actions.ts#payForJob": action(
    "/jobs/[id]",
    HOMEOWNER_OWNER_ONLY,
    async (ctx) => [prev, form({ jobId: String((await jobIn(ctx, "awaiting_payment")).id) })],
    { id: "job" },
  ),
  "components/jobs/actions.ts#cancelJobAction": action(
    "/jobs/[id]",
    HOMEOWNER_OWNER_ONLY,
    async (ctx) => [prev, form({ jobId: String((await jobIn(ctx, "awaiting_payment")).id) })],
    { id: "job" },
  ),
  "components/jobs/actions.ts#cancelForRefundAction": action(
    "/jobs/[id]",
    rule<ActionOutcome>("refused", { anonymous: "signin" }),
    // The fixture's payment never reached the payment fake, so even the owner's refund is
    // refused: this row checks only that nobody else gets further than the owner.
    async (ctx) => [prev, form({ jobId: String((await jobIn(ctx, "funded")).id) })],
    { id: "job" },
  ),
  "components/jobs/actions.ts#releaseAction": action(
    "/jobs/[id]",
    rule<ActionOutcome>("refused", { anonymous: "signin" }),
    // As above: the transfer needs a real charge on the fake; the refusals are what is checked.
    async (ctx) => [prev, form({ jobId: String((await jobIn(ctx, "delivered")).id) })],
    { id: "job" },
  ),
  "components/jobs/actions.ts#disputeAction": action(
    "/jobs/[id]",
    HOMEOWNER_OWNER_ONLY,
    async (ctx) => [
      prev,
      form({
        jobId: String((await jobIn(ctx, "delivered")).id),
        reason: "The report does not cover the relief discharge at all (matrix).",
      }),
    ],
    { id: "job" },
  ),
  // The settle form lives on the job page (the admin's dispute list links there).
  "components/jobs/actions.ts#settleAction": action(
    "/jobs/[id]",
    rule<ActionOutcome>("refused", { anonymous: "signin" }),
    // Settling moves money on the fake, which the fixture's dispute never paid: refusals only.
    async (ctx) => [
      prev,
      form({ jobId: String((await jobIn(ctx, "disputed")).id), resolution: "release" }),
    ],
    { id: "job" },
  ),
  "components/jobs/actions.ts#setUpPayoutAccount": action(
    "/reviewer/earnings",
    rule<ActionOutcome>("ok", {
      anonymous: "signin",
      owner: "refused",
      otherHomeowner: "refused",
      admin: "refused",
    }),
    async ({ knex, w, actor }) => {
      // Fixture reviewers carry made-up account ids the payment fake has never seen: start afresh.
      const person = actor === "anonymous" ? undefined : w.people[actor];
      if (person?.role === "reviewer")
        await knex("reviewer_profiles")
          .where({ user_id: person.id })
          .update({ payment_account_id: null, payouts_enabled: false });
      return [prev, form({})];
    },
  ),

  // Reviewers
  "components/reviewer/actions.ts#saveProfile": action(
    "/reviewer/profile",
    rule<ActionOutcome>("refused", { anonymous: "signin", ...REVIEWER_OK }),
    () => [
      prev,
      form({
        tradingName: "Matrix Heating",
        bio: "Solar thermal and unvented cylinder work (matrix).",
        yearsInTrade: "10",
        region: "south-west",
        specialisms: ["flat_plate"],
      }),
    ],
  ),
  "components/reviewer/actions.ts#submitCredential": action(
    "/reviewer/credentials",
    rule<ActionOutcome>("refused", { anonymous: "signin", ...REVIEWER_OK }),
    () => [
      prev,
      form({
        kind: "unvented_hot_water_competence",
        issuer: "Matrix Trade Body",
        number: "MX-1",
        expiresOn: new Date(Date.now() + 200 * 86_400_000).toISOString().slice(0, 10),
      }),
    ],
  ),

  // The review and what follows it
  "components/review/actions.ts#startReviewAction": action(
    "/jobs/[id]/review",
    rule<ActionOutcome>("refused", { anonymous: "signin", jobReviewer: "ok" }),
    async (ctx) => [prev, form({ jobId: String((await jobIn(ctx, "funded")).id) })],
    { id: "job" },
  ),
  "components/review/actions.ts#addAddendumAction": action(
    "/jobs/[id]/report",
    rule<ActionOutcome>("refused", { anonymous: "signin", jobReviewer: "ok" }),
    async (ctx) => [
      prev,
      form({
        jobId: String((await jobIn(ctx, "delivered")).id),
        bodyMd: "A dated matrix addendum.",
      }),
    ],
    { id: "job" },
  ),
  // Answering needs a question the reviewer asked on this homeowner's job (the round trip:
  // tests/integration/review.test.ts); here no one gets an answer onto a question that is not theirs.
  "components/review/actions.ts#answerItemRequestAction": action(
    "/projects/[id]",
    rule<ActionOutcome>("refused", { anonymous: "signin" }),
    (ctx) => [
      prev,
      form({
        itemRequestId: "999999",
        projectId: String(ctx.w.job.project.id),
        answerMd: "A fact.",
      }),
    ],
    { id: "jobProject" },
  ),
  "components/aftercare/actions.ts#rateReviewerAction": action(
    "/jobs/[id]",
    HOMEOWNER_OWNER_ONLY,
    async (ctx) => [
      prev,
      form({ jobId: String((await jobIn(ctx, "released")).id), stars: "5", comment: "Matrix." }),
    ],
    { id: "job" },
  ),
  "components/aftercare/actions.ts#replyToRatingAction": action(
    "/jobs/[id]",
    rule<ActionOutcome>("refused", { anonymous: "signin", jobReviewer: "ok" }),
    async (ctx) => {
      const job = await jobIn(ctx, "released");
      await ctx.knex("ratings").insert({
        job_id: job.id,
        rater_id: ctx.w.people.owner.id,
        ratee_id: ctx.w.people.jobReviewer.id,
        stars: 5,
        comment: "",
      });
      return [prev, form({ jobId: String(job.id), replyMd: "Thank you for the rating." })];
    },
    { id: "job" },
  ),
  "components/aftercare/actions.ts#tagPhotoAction": action(
    "/projects/[id]",
    HOMEOWNER_OWNER_ONLY,
    (ctx) => [
      prev,
      form({
        projectId: String(ctx.w.job.project.id),
        attachmentId: String(ctx.w.fileId),
        itemKeys: ["vessel-rating"],
      }),
    ],
    { id: "jobProject" },
  ),
  "components/aftercare/actions.ts#saveFirstFillAction": action(
    "/projects/[id]/first-fill",
    HOMEOWNER_OWNER_ONLY,
    async (ctx) => {
      const job = await jobIn(ctx, "delivered");
      return [
        prev,
        form({
          jobId: String(job.id),
          projectId: String(job.project.id),
          coldFillBar: "1.9",
          prechargeBar: "1.2",
          glycolPercentMass: "40",
        }),
      ];
    },
    { id: "jobProject" },
  ),
  "components/aftercare/actions.ts#countersignAction": action(
    "/projects/[id]/first-fill",
    rule<ActionOutcome>("refused", { anonymous: "signin", jobReviewer: "ok" }),
    async (ctx) => {
      const job = await jobIn(ctx, "delivered");
      await saveFirstFill(ctx.knex, ctx.w.people.owner, job.id, {
        coldFillBar: "1.9",
        prechargeBar: "1.2",
        glycolPercentMass: "40",
      });
      return [
        prev,
        form({ jobId: String(job.id), projectId: String(job.project.id), comment: "Seen." }),
      ];
    },
    { id: "jobProject" },
  ),
  // Site visits: the world's job is a remote check, so nobody may propose, confirm or ask for
  // another visit on it (who may do each on a site visit: tests/integration/site-visit.test.ts).
  "components/jobs/visit-actions.ts#proposeVisitAction": action(
    "/jobs/[id]",
    rule<ActionOutcome>("refused", { anonymous: "signin" }),
    (ctx) => [prev, form({ jobId: String(ctx.w.job.id), date: "2030-05-02", time: "10:00" })],
    { id: "job" },
  ),
  "components/jobs/visit-actions.ts#confirmVisitAction": action(
    "/jobs/[id]",
    rule<ActionOutcome>("refused", { anonymous: "signin" }),
    (ctx) => [prev, form({ jobId: String(ctx.w.job.id), sequence: "0" })],
    { id: "job" },
  ),
  "components/jobs/visit-actions.ts#askAnotherVisitAction": action(
    "/jobs/[id]",
    rule<ActionOutcome>("refused", { anonymous: "signin" }),
    (ctx) => [prev, form({ jobId: String(ctx.w.job.id), note: "Another day, please." })],
    { id: "job" },
  ),

  // Admin
  "components/admin/actions.ts#decideCredentialAction": action(
    "/admin/credentials",
    ADMIN_ONLY,
    async (ctx) => {
      const r = await makeReviewer(ctx.knex, { verified: false });
      const c = await ctx.knex("credentials").where({ reviewer_id: r.id }).first("id");
      return [
        prev,
        form({ decision: "reject", credentialId: String(c.id), reason: "Matrix check." }),
      ];
    },
  ),
  "components/admin/actions.ts#suspensionAction": action(
    "/admin/reviewers/[id]",
    ADMIN_ONLY,
    async (ctx) => {
      const r = await makeReviewer(ctx.knex);
      return [prev, form({ reviewerId: String(r.id), suspend: "1", reason: "Matrix check." })];
    },
    { id: "jobReviewer" },
  ),
};
