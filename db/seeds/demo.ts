/**
 * The demo scenario: invented people in invented towns, marked is_demo. Nothing here comes
 * from a real installation; the systems are variations of lib/calc/demo-system.ts.
 * Idempotent: if the demo admin exists the scenario is already there and nothing is written.
 */
import type { Knex } from "knex";
import bcrypt from "bcryptjs";
import { demoSystem } from "../../lib/calc/demo-system";
import { runLoopCheck } from "../../lib/calc/loop-check";
import { systemSchema, type SystemInput } from "../../lib/validation/system";
import { CATALOGUE_VERSION } from "../../lib/checklist/catalogue";
import { buildChecklist } from "../../lib/checklist/build";
import { itemTitle } from "../../lib/checklist/item-titles";
import type { ReportSnapshot } from "../../lib/types/review";
import { CREDENTIAL_KINDS } from "../../lib/credentials";
import { JOB_STATES, splitFee } from "../../lib/jobs";

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

function requestSnapshot(system: ReturnType<typeof systemSchema.parse>) {
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

/** A delivered demo report as the workspace freezes it: all sound but the vessel size. */
function demoReport(system: ReturnType<typeof systemSchema.parse>): ReportSnapshot {
  const check = runLoopCheck(system);
  const list = buildChecklist(system, check.findings);
  return {
    format: 1,
    catalogueVersion: list.version,
    worst: check.worst,
    outcome: "fix_before_filling",
    summaryMd:
      "The loop is sound apart from the vessel: fit the larger size before filling. (demo)",
    requiredChanges: [
      {
        text: "Fit an 18 L solar expansion vessel on a cooling leg. (demo)",
        itemKeys: ["vessel-size"],
      },
    ],
    items: list.items.map((i) => ({
      key: i.key,
      title: itemTitle(i.key),
      section: i.section,
      check: i.check,
      basis: i.basis,
      verdict: i.key === "vessel-size" ? "concern" : "sound",
      noteMd:
        i.key === "vessel-size"
          ? "The vessel is too small to take the collector's contents as steam. (demo)"
          : "",
      pins: [],
      evidence: i.evidence,
    })),
    files: [],
  };
}

const addDays = (d: Date, days: number) => new Date(d.getTime() + days * 86_400_000);
const sqlDate = (d: Date) => d.toISOString().slice(0, 10);
const sqlDateTime = (d: Date) => d.toISOString().slice(0, 23).replace("T", " ");

export interface SeedSummary {
  seeded: boolean;
  users: number;
  projects: number;
  requests: number;
  jobs: number;
}

export async function seedDemo(knex: Knex, now = new Date()): Promise<SeedSummary> {
  return knex.transaction(async (trx) => {
    const existing = await trx("users").where({ email: DEMO_USERS.admin.email }).first("id");
    if (existing) return { seeded: false, users: 0, projects: 0, requests: 0, jobs: 0 };

    const hash = await bcrypt.hash(DEMO_PASSWORD, 10);
    const insertUser = async (email: string, name: string, role: string) => {
      const [id] = await trx("users").insert({
        email,
        display_name: name,
        role,
        password_hash: hash,
        email_verified_at: sqlDateTime(now),
        is_demo: true,
      });
      return Number(id);
    };

    const adminId = await insertUser(DEMO_USERS.admin.email, DEMO_USERS.admin.name, "admin");
    const homeownerIds: number[] = [];
    for (const h of DEMO_USERS.homeowners)
      homeownerIds.push(await insertUser(h.email, h.name, "homeowner"));

    const reviewerIds: number[] = [];
    for (const r of DEMO_USERS.reviewers) {
      const id = await insertUser(r.email, r.name, "reviewer");
      reviewerIds.push(id);
      await trx("reviewer_profiles").insert({
        user_id: id,
        trading_name: `${r.trading} (demo)`,
        bio: "Demo reviewer. Solar thermal, unvented cylinders and boiler integration.",
        years_in_trade: 8 + reviewerIds.length * 3,
        specialisms: JSON.stringify(["flat_plate", "evacuated_tube", "unvented_cylinders"]),
        region: r.region,
        travel_radius_km: 40,
        hourly_rate_minor: 5500,
        currency: "GBP",
        // Payout accounts are set up on the payment service's page (the demo tour does it).
        payment_account_id: null,
        payouts_enabled: false,
      });
      for (const kind of CREDENTIAL_KINDS) {
        const status =
          r.state === "verified"
            ? "verified"
            : r.state === "expired" && kind === "public_liability_insurance"
              ? "expired"
              : r.state === "expired"
                ? "verified"
                : "pending";
        const expires = status === "expired" ? addDays(now, -10) : addDays(now, 300);
        await trx("credentials").insert({
          reviewer_id: id,
          kind,
          issuer: "Demo Trade Body",
          number: `DEMO-${id}-${kind.slice(0, 4).toUpperCase()}`,
          expires_on: sqlDate(expires),
          status,
          reviewed_by: status === "pending" ? null : adminId,
          reviewed_at: status === "pending" ? null : sqlDateTime(addDays(now, -30)),
        });
      }
    }
    const verifiedReviewers = reviewerIds.slice(0, 2);

    const regions = ["south-west", "wales", "south-east", "yorkshire"];
    const projectIds: {
      id: number;
      owner: number;
      region: string;
      collectorType: string;
      system: ReturnType<typeof systemSchema.parse>;
    }[] = [];
    for (let i = 0; i < 14; i++) {
      const owner = homeownerIds[i % homeownerIds.length]!;
      const region = regions[i % regions.length]!;
      const system = systemSchema.parse(variant(i, region));
      const check = runLoopCheck(system);
      const [id] = await trx("projects").insert({
        owner_id: owner,
        title: `${DEMO_USERS.homeowners[i % 4]!.town} house, loop ${Math.floor(i / 4) + 1} (demo)`,
        system: JSON.stringify(system),
        region,
        collector_type: system.collectors.type,
        collector_area_m2: system.collectors.count * system.collectors.apertureAreaM2Each,
        worst_level: check.worst,
        status: i === 13 ? "draft" : "ready",
      });
      projectIds.push({
        id: Number(id),
        owner,
        region,
        collectorType: system.collectors.type,
        system,
      });
    }

    // Requests: one per job state (awarded or cancelled), and the rest open on the board.
    let requests = 0;
    let jobs = 0;
    for (let i = 0; i < projectIds.length - 1; i++) {
      const p = projectIds[i]!;
      const kind = i % 3 === 0 ? "site_visit" : "remote_check";
      const jobState = JOB_STATES[i];
      const status =
        jobState === undefined ? "open" : jobState === "cancelled" ? "cancelled" : "awarded";
      const created = addDays(now, -20 + i);
      const [requestId] = await trx("requests").insert({
        project_id: p.id,
        homeowner_id: p.owner,
        kind,
        status,
        questions:
          "Is the vessel big enough for steam, and is the pre-charge right for the static height? (demo)",
        budget_min_minor: 6000 + i * 500,
        budget_max_minor: 15000 + i * 1000,
        currency: "GBP",
        region: p.region,
        collector_type: p.collectorType,
        window_start: kind === "site_visit" ? sqlDate(addDays(now, 7)) : null,
        window_end: kind === "site_visit" ? sqlDate(addDays(now, 28)) : null,
        access_notes:
          kind === "site_visit" ? "Loft hatch on the landing; scaffold booked. (demo)" : null,
        expires_at: sqlDateTime(addDays(created, 30)),
        created_at: sqlDateTime(created),
        // What posting keeps: the system and the loop check with its checklist (lib/data/projects.ts).
        ...requestSnapshot(p.system),
      });
      requests += 1;
      const quoteIds: number[] = [];
      for (const [k, reviewerId] of verifiedReviewers.entries()) {
        const [quoteId] = await trx("quotes").insert({
          request_id: requestId,
          reviewer_id: reviewerId,
          price_minor: 8500 + k * 2000 + i * 100,
          currency: "GBP",
          turnaround_days: 3 + k * 2,
          scope_md:
            "Full checklist review of the sketch, photos and loop check, with a written report. (demo)",
          proposed_visit_date: kind === "site_visit" ? sqlDate(addDays(now, 10 + k)) : null,
          status: jobState ? (k === 0 ? "accepted" : "declined") : "live",
        });
        quoteIds.push(Number(quoteId));
      }
      if (jobState) {
        const amount = 8500 + i * 100;
        const fee = splitFee(amount, 12).feeMinor;
        const funded = jobState !== "awaiting_payment";
        const delivered = [
          "delivered",
          "disputed",
          "released",
          "partially_refunded",
          "refunded",
        ].includes(jobState);
        const [jobId] = await trx("jobs").insert({
          request_id: requestId,
          quote_id: quoteIds[0],
          homeowner_id: p.owner,
          reviewer_id: verifiedReviewers[0],
          state: jobState,
          amount_minor: amount,
          fee_minor: fee,
          currency: "GBP",
          checkout_session_id: `cs_demo_${requestId}`,
          payment_intent_id: funded ? `pi_demo_${requestId}` : null,
          funded_at: funded ? sqlDateTime(addDays(now, -5)) : null,
          delivered_at: delivered ? sqlDateTime(addDays(now, -2)) : null,
          release_due_at: jobState === "delivered" ? sqlDateTime(addDays(now, 5)) : null,
          closed_at: ["released", "partially_refunded", "refunded", "cancelled"].includes(jobState)
            ? sqlDateTime(now)
            : null,
        });
        jobs += 1;
        if (funded) {
          await trx("ledger_entries").insert({
            job_id: jobId,
            kind: "charge",
            amount_minor: amount,
            currency: "GBP",
            provider_ref: `pi_demo_${requestId}`,
            idempotency_key: `job-${jobId}-charge`,
          });
        }
        if (jobState === "released") {
          await trx("ledger_entries").insert([
            {
              job_id: jobId,
              kind: "fee",
              amount_minor: fee,
              currency: "GBP",
              idempotency_key: `job-${jobId}-fee`,
            },
            {
              job_id: jobId,
              kind: "transfer",
              amount_minor: amount - fee,
              currency: "GBP",
              provider_ref: `tr_demo_${jobId}`,
              idempotency_key: `job-${jobId}-release`,
            },
          ]);
        }
        if (jobState === "refunded" || jobState === "partially_refunded") {
          const refund = jobState === "refunded" ? amount : Math.round(amount / 2);
          await trx("ledger_entries").insert({
            job_id: jobId,
            kind: "refund",
            amount_minor: -refund,
            currency: "GBP",
            provider_ref: `re_demo_${jobId}`,
            idempotency_key: `job-${jobId}-refund`,
          });
        }
        if (["in_review", ...(delivered ? [jobState] : [])].includes(jobState)) {
          const frozen = delivered ? demoReport(p.system) : null;
          const [reportId] = await trx("reports").insert({
            job_id: jobId,
            catalogue_version: CATALOGUE_VERSION,
            status: delivered ? "delivered" : "draft",
            outcome: frozen?.outcome ?? null,
            summary_md: frozen?.summaryMd ?? null,
            required_changes: JSON.stringify(frozen?.requiredChanges ?? []),
            checklist_snapshot: frozen ? JSON.stringify(frozen) : null,
            findings_snapshot: frozen ? JSON.stringify(runLoopCheck(p.system).findings) : null,
            snapshot_format: frozen ? frozen.format : null,
            delivered_at: delivered ? sqlDateTime(addDays(now, -2)) : null,
          });
          if (frozen)
            await trx("checklist_answers").insert(
              frozen.items.map((it) => ({
                report_id: reportId,
                item_key: it.key,
                verdict: it.verdict,
                note_md: it.noteMd,
                pins: "[]",
                version: 1,
              })),
            );
        }
        if (["disputed", "partially_refunded", "refunded"].includes(jobState)) {
          await trx("disputes").insert({
            job_id: jobId,
            opened_by: p.owner,
            reason: "The report did not answer my question about the relief discharge. (demo)",
            status: jobState === "disputed" ? "open" : "settled",
            resolution:
              jobState === "refunded"
                ? "full_refund"
                : jobState === "partially_refunded"
                  ? "partial_refund"
                  : null,
            refund_minor:
              jobState === "refunded"
                ? amount
                : jobState === "partially_refunded"
                  ? Math.round(amount / 2)
                  : null,
            settled_by: jobState === "disputed" ? null : adminId,
            settled_at: jobState === "disputed" ? null : sqlDateTime(now),
          });
        }
        if (jobState === "released") {
          await trx("ratings").insert({
            job_id: jobId,
            rater_id: p.owner,
            ratee_id: verifiedReviewers[0],
            stars: 5,
            comment: "Clear and quick. (demo)",
          });
        }
        await trx("audit_log").insert({
          actor_id: p.owner,
          action: "job.seeded",
          entity_type: "job",
          entity_id: jobId,
          detail: JSON.stringify({ state: jobState, demo: true }),
        });
      }
    }
    return {
      seeded: true,
      users: 1 + homeownerIds.length + reviewerIds.length,
      projects: projectIds.length,
      requests,
      jobs,
    };
  });
}
