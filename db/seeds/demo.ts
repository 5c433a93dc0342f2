/**
 * The demo scenario: invented people in invented towns, marked is_demo. Nothing here comes
 * from a real installation; the systems are variations of lib/calc/demo-system.ts.
 *
 * It is written the way people would make it, through the same lib/data functions as the app:
 * sign-ups, profiles, credentials checked by the admin, projects described step by step,
 * requests, quotes, acceptance, payment on the payment service's checkout page (the local fake,
 * which must be running), the review, delivery, disputes, release and refunds. So every demo
 * row obeys the same rules, e-mails and audit trail as real use. Only the demo flag is the
 * seed's own (lib/data/demo.ts).
 *
 * Idempotent: if the demo admin exists the scenario is already there and nothing is written.
 * One transaction: a failure halfway leaves nothing behind (calls already made to the payment
 * fake stay there, unused).
 */
import type { Knex } from "knex";
import { demoSystem } from "../../lib/calc/demo-system";
import { systemSchema, systemSections, type SystemInput } from "../../lib/validation/system";
import { CREDENTIAL_KINDS } from "../../lib/credentials";
import { JOB_STATES, type JobState } from "../../lib/jobs";
import { env } from "../../lib/env";
import type { Actor } from "../../lib/data/actor";
import { createAccount, createAdminAccount } from "../../lib/data/accounts";
import { markDemoAccount } from "../../lib/data/demo";
import { saveReviewerProfile, addCredential, decideCredential } from "../../lib/data/reviewers";
import { startPayoutSetup, syncPayoutAccount } from "../../lib/data/payments";
import { createProject, createRequest, saveProjectSection } from "../../lib/data/projects";
import { acceptQuote, submitQuote } from "../../lib/data/quotes";
import {
  cancelJob,
  jobServices,
  openDispute,
  releaseJob,
  settleDispute,
  startCheckout,
  syncCheckout,
  type JobServices,
} from "../../lib/data/jobs";
import { rateReviewer, replyToRating } from "../../lib/data/ratings";
import {
  deliverReport,
  getReviewWorkspace,
  saveAnswer,
  saveReportDraft,
  startJobReview,
} from "../../lib/data/review";

export const DEMO_PASSWORD = "demo-loop-2026";

export const DEMO_USERS = {
  admin: { email: "admin@demo.loopwright.test", name: "Priya Admin (demo)", role: "admin" },
  homeowners: [
    { email: "hana@demo.loopwright.test", name: "Hana Whitlow (demo)", town: "Hollowmere" },
    { email: "owen@demo.loopwright.test", name: "Owen Castellan (demo)", town: "Kestlebury" },
    { email: "mira@demo.loopwright.test", name: "Mira Oduya (demo)", town: "Ashcombe Vale" },
    { email: "tobin@demo.loopwright.test", name: "Tobin Reyes (demo)", town: "Brindle Cross" },
  ],
  reviewers: [
    {
      email: "sol@demo.loopwright.test",
      name: "Sol Brannagh (demo)",
      trading: "Brannagh Solar & Heating",
      region: "south-west",
      state: "verified",
    },
    {
      email: "ines@demo.loopwright.test",
      name: "Ines Marwood (demo)",
      trading: "Marwood Plumbing",
      region: "wales",
      state: "verified",
    },
    {
      email: "dev@demo.loopwright.test",
      name: "Dev Halloran (demo)",
      trading: "Halloran Heat",
      region: "south-east",
      state: "pending",
    },
    {
      email: "kit@demo.loopwright.test",
      name: "Kit Ambrose (demo)",
      trading: "Ambrose Renewables",
      region: "yorkshire",
      state: "expired",
    },
  ],
} as const;

/** Variations of the example system, so the board has a mix of kinds, regions and collectors. */
function variant(i: number, region: string): SystemInput {
  const evacuated = i % 3 === 1;
  const s = structuredClone(demoSystem);
  s.site = {
    ...s.site,
    region: region as SystemInput["site"]["region"],
    designMinTempC: -8 - (i % 4) * 3,
  };
  s.collectors = {
    ...s.collectors,
    type: evacuated ? "evacuated_tube" : "flat_plate",
    count: 1 + (i % 3),
    fluidContentLEach: evacuated ? 1.1 : 1.6,
  };
  // One in four has an undersized vessel, so the demo shows a `fix` finding.
  s.expansionVessel = { ...s.expansionVessel, nominalVolumeL: i % 4 === 2 ? 8 : 18 };
  s.cylinder = { ...s.cylinder, type: i % 2 === 0 ? "unvented" : "vented" };
  return s;
}

const addDays = (d: Date, days: number) => new Date(d.getTime() + days * 86_400_000);
const isoDate = (d: Date) => d.toISOString().slice(0, 10);

export interface SeedSummary {
  seeded: boolean;
  users: number;
  projects: number;
  requests: number;
  jobs: number;
}

/** Acts on the payment fake's own pages, as the person in the browser would. */
async function submitFakePage(url: string, form: Record<string, string>): Promise<void> {
  const res = await fetch(url, {
    method: "POST",
    body: new URLSearchParams(form),
    redirect: "manual",
  });
  if (res.status >= 400)
    throw new Error(`the payment fake's page answered ${res.status} at ${new URL(url).pathname}`);
}

/** The states a demo job passes through to reach `target`, after acceptance. */
function pathTo(target: JobState): JobState[] {
  const paths: Record<JobState, JobState[]> = {
    awaiting_payment: [],
    cancelled: ["cancelled"],
    funded: ["funded"],
    in_review: ["funded", "in_review"],
    delivered: ["funded", "in_review", "delivered"],
    disputed: ["funded", "in_review", "delivered", "disputed"],
    released: ["funded", "in_review", "delivered", "released"],
    partially_refunded: ["funded", "in_review", "delivered", "disputed", "partially_refunded"],
    refunded: ["funded", "in_review", "delivered", "disputed", "refunded"],
  };
  return paths[target];
}

export async function seedDemo(knex: Knex, svc: JobServices = jobServices()): Promise<SeedSummary> {
  const appUrl = env().APP_URL;
  const now = new Date();
  return knex.transaction(async (trx) => {
    const existing = await trx("users").where({ email: DEMO_USERS.admin.email }).first("id");
    if (existing) return { seeded: false, users: 0, projects: 0, requests: 0, jobs: 0 };

    const admin: Actor = await createAdminAccount(trx, {
      email: DEMO_USERS.admin.email,
      displayName: DEMO_USERS.admin.name,
      password: DEMO_PASSWORD,
    });
    await markDemoAccount(trx, admin.id);
    const signUp = async (email: string, displayName: string, role: "homeowner" | "reviewer") => {
      const user = await createAccount(
        trx,
        { email, displayName, role, password: DEMO_PASSWORD },
        appUrl,
        // The seed signs its eight people up from one place, within the sign-up limit per address.
        "demo-seed",
      );
      await markDemoAccount(trx, user.id);
      return { id: user.id, role: user.role };
    };

    const homeowners: Actor[] = [];
    for (const h of DEMO_USERS.homeowners)
      homeowners.push(await signUp(h.email, h.name, "homeowner"));

    // Reviewers: a profile, one credential of each kind checked by the admin (or still waiting),
    // and for the first a payout account set up on the payment fake's page.
    const reviewers: Actor[] = [];
    for (const [n, r] of DEMO_USERS.reviewers.entries()) {
      const reviewer = await signUp(r.email, r.name, "reviewer");
      reviewers.push(reviewer);
      await saveReviewerProfile(trx, reviewer, {
        tradingName: `${r.trading} (demo)`,
        bio: "Demo reviewer. Solar thermal, unvented cylinders and boiler integration.",
        yearsInTrade: 11 + n * 3,
        specialisms: ["flat_plate", "evacuated_tube", "unvented_cylinders"],
        region: r.region,
        travelRadiusKm: 40,
        hourlyRatePounds: 55,
      });
      for (const kind of CREDENTIAL_KINDS) {
        const id = await addCredential(trx, reviewer, {
          kind,
          issuer: "Demo Trade Body",
          number: `DEMO-${reviewer.id}-${kind.slice(0, 4).toUpperCase()}`,
          expiresOn: isoDate(addDays(now, 300)),
        });
        if (r.state === "pending") continue;
        // The expired reviewer's insurance ran out ten days ago: the admin read that date off it.
        const lapsed = r.state === "expired" && kind === "public_liability_insurance";
        await decideCredential(
          trx,
          admin,
          {
            decision: "verify",
            credentialId: id,
            expiresOn: isoDate(addDays(now, lapsed ? -10 : 300)),
          },
          appUrl,
        );
      }
    }
    const [sol, ines] = reviewers as [Actor, Actor];
    const setupUrl = await startPayoutSetup(trx, sol, svc);
    const link = new URL(setupUrl);
    await submitFakePage(`${link.origin}${link.pathname}`, {
      link: link.searchParams.get("link") ?? "",
      action: "complete",
    });
    await syncPayoutAccount(trx, sol, svc);

    // Projects, described step by step; the last one is a draft with three steps done.
    const regions = ["south-west", "wales", "south-east", "yorkshire"];
    const projects: { id: number; owner: Actor }[] = [];
    for (let i = 0; i < 14; i++) {
      const owner = homeowners[i % homeowners.length]!;
      const system = systemSchema.parse(variant(i, regions[i % regions.length]!));
      const id = await createProject(trx, owner, {
        title: `${DEMO_USERS.homeowners[i % 4]!.town} house, loop ${Math.floor(i / 4) + 1} (demo)`,
      });
      const steps = i === 13 ? systemSections.slice(0, 3) : systemSections;
      for (const section of steps)
        await saveProjectSection(trx, owner, id, section, system[section]);
      projects.push({ id, owner });
    }

    // Requests: one per job state, and the rest open on the board. Both verified reviewers quote
    // on each; the homeowner takes the first reviewer's quote where there is a job.
    let requests = 0;
    let jobs = 0;
    for (let i = 0; i < projects.length - 1; i++) {
      const { id: projectId, owner } = projects[i]!;
      const siteVisit = i % 3 === 0;
      const requestId = await createRequest(trx, owner, projectId, {
        kind: siteVisit ? "site_visit" : "remote_check",
        questions:
          "Is the vessel big enough for steam, and is the pre-charge right for the static height? (demo)",
        // Where the loop check found a `stop`, the homeowner has read why and confirmed the loop
        // will not be filled or run until it is resolved (the posting form's safety gate).
        acknowledgeStop: true,
        budgetMinPounds: 60 + i * 5,
        budgetMaxPounds: 150 + i * 10,
        ...(siteVisit
          ? {
              windowStart: isoDate(addDays(now, 7)),
              windowEnd: isoDate(addDays(now, 28)),
              accessNotes: "Loft hatch on the landing; scaffold booked. (demo)",
            }
          : {}),
      });
      requests += 1;
      const quoteIds: number[] = [];
      for (const [k, reviewer] of [sol, ines].entries()) {
        quoteIds.push(
          await submitQuote(
            trx,
            reviewer,
            requestId,
            {
              pricePounds: 85 + k * 20 + i,
              turnaroundDays: 3 + k * 2,
              scopeMd:
                "Full checklist review of the sketch, photos and loop check, with a written report. (demo)",
              ...(siteVisit ? { proposedVisitDate: isoDate(addDays(now, 10 + k)) } : {}),
            },
            appUrl,
          ),
        );
      }
      const target = JOB_STATES[i];
      if (!target) continue;
      const jobId = await acceptQuote(trx, owner, quoteIds[0]!, appUrl);
      jobs += 1;
      for (const state of pathTo(target)) await advance(trx, jobId, state, { owner, sol, admin });
    }

    return {
      seeded: true,
      users: 1 + homeowners.length + reviewers.length,
      projects: projects.length,
      requests,
      jobs,
    };
  });

  /** One step of a demo job, by the person who would take it. */
  async function advance(
    trx: Knex.Transaction,
    jobId: number,
    state: JobState,
    who: { owner: Actor; sol: Actor; admin: Actor },
  ): Promise<void> {
    switch (state) {
      case "cancelled":
        return cancelJob(trx, who.owner, jobId);
      case "funded": {
        // The homeowner pays with the test card on the fake's checkout page; the job is funded
        // from the payment service's answer (the webhook may come later; it then changes nothing).
        const url = await startCheckout(trx, who.owner, jobId, svc);
        await submitFakePage(`${url}/pay`, { card: "ok" });
        if ((await syncCheckout(trx, who.owner, jobId, svc)) !== "funded")
          throw new Error(`demo job ${jobId} was not funded by its checkout`);
        return;
      }
      case "in_review":
        return startJobReview(trx, who.sol, jobId);
      case "delivered": {
        // The reviewer answers every item (the vessel size as a concern), writes the report
        // and delivers it: the report is frozen and the homeowner e-mailed.
        const ws = await getReviewWorkspace(trx, who.sol, jobId);
        const vessel = ws.items.filter((item) => item.key === "vessel-size");
        for (const item of ws.items) {
          const concern = vessel.includes(item);
          await saveAnswer(trx, who.sol, jobId, item.key, {
            verdict: concern ? "concern" : "sound",
            noteMd: concern
              ? "The vessel is on the small side for this collector volume; see the loop check. (demo)"
              : "Seen on the sketch and photos; as described. (demo)",
            expectedVersion: ws.answers[item.key]?.version ?? 0,
          });
        }
        await saveReportDraft(trx, who.sol, jobId, {
          outcome: "fix_before_filling",
          summaryMd:
            "The loop is sound apart from the vessel: fit the larger size before filling. (demo)",
          requiredChanges: [
            {
              text: "Fit an 18 L solar expansion vessel on a cooling leg. (demo)",
              itemKeys: vessel.map((item) => item.key),
            },
          ],
          expectedVersion: ws.draft.version,
        });
        await deliverReport(trx, who.sol, jobId, appUrl);
        return;
      }
      case "disputed":
        return openDispute(
          trx,
          who.owner,
          jobId,
          { reason: "The report did not answer my question about the relief discharge. (demo)" },
          appUrl,
        );
      case "released":
        await releaseJob(trx, who.owner, jobId, svc);
        await rateReviewer(trx, who.owner, jobId, { stars: 5, comment: "Clear and quick. (demo)" });
        await replyToRating(trx, who.sol, jobId, {
          replyMd: "Thank you; good luck with the first fill. (demo)",
        });
        return;
      case "partially_refunded": {
        const job = await trx("jobs").where({ id: jobId }).first("amount_minor");
        return settleDispute(
          trx,
          who.admin,
          jobId,
          { resolution: "partial_refund", refundMinor: Math.round(Number(job.amount_minor) / 2) },
          svc,
        );
      }
      case "refunded":
        return settleDispute(trx, who.admin, jobId, { resolution: "full_refund" }, svc);
      case "awaiting_payment":
        return;
    }
  }
}
