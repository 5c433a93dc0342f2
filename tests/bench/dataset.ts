/**
 * The bench dataset: generated rows in bulk, written by MariaDB itself with INSERT … SELECT over
 * its SEQUENCE engine (seq_1_to_N), so 500,000 rows take seconds rather than minutes.
 *
 *   5,000 reviewers (profiles, verified credentials), 10,000 homeowners, 20,000 projects,
 *   100,000 requests (one open request on most projects, the rest awarded, cancelled or expired),
 *   300,000 quotes (three per request), 25,000 threads with 50,000 messages, a job for each
 *   awarded request and ledger rows for the funded ones.
 *
 * The demo seed runs first, so the demo sign-ins (a verified reviewer, a homeowner) work.
 * Generated ids start at BASE so they never meet the demo's.
 */
import bcrypt from "bcryptjs";
import type { Knex } from "knex";
import { DEMO_USERS, seedDemo } from "@/db/seeds/demo";
import { demoSystem } from "@/lib/calc/demo-system";
import { runLoopCheck } from "@/lib/calc/loop-check";
import { buildChecklist } from "@/lib/checklist/build";
import { REQUIRED_CREDENTIAL_KINDS } from "@/lib/credentials";
import { REGION_IDS } from "@/lib/regions";
import { systemSchema } from "@/lib/validation/system";
import { migrationSource } from "@/db/migrations/index";

export const BASE = 1_000_000;
/** Generated homeowners are HOMEOWNER_BASE + 1 … + 10,000. */
export const HOMEOWNER_BASE = BASE + 100_000;
export const COUNTS = {
  reviewers: 5_000,
  homeowners: 10_000,
  projects: 20_000,
  requests: 100_000,
  quotesPerRequest: 3,
  threads: 25_000,
  messagesPerThread: 2,
};

export interface DatasetSummary {
  seconds: number;
  rows: Record<string, number>;
}

async function truncateAll(knex: Knex) {
  const rows = (await knex.raw("SHOW TABLES"))[0] as Record<string, string>[];
  const tables = rows.map((r) => Object.values(r)[0]!).filter((t) => !t.startsWith("knex_"));
  await knex.raw("SET FOREIGN_KEY_CHECKS = 0");
  for (const t of tables) await knex.raw("TRUNCATE TABLE ??", [t]);
  await knex.raw("SET FOREIGN_KEY_CHECKS = 1");
}

/** Migrate, wipe and fill the bench database. `knex` must use a pool of one connection. */
export async function seedBenchData(knex: Knex): Promise<DatasetSummary> {
  const t0 = performance.now();
  await knex.migrate.latest({ migrationSource });
  await truncateAll(knex);
  await seedDemo(knex);
  const hash = await bcrypt.hash("bench-user-password", 4);
  const regions = REGION_IDS.map((r) => knex.raw("?", [r]).toQuery()).join(",");
  const nRegions = REGION_IDS.length;
  const system = systemSchema.parse(demoSystem);
  const check = runLoopCheck(system);
  const checklist = buildChecklist(system, check.findings);
  const systemJson = JSON.stringify(system);
  const snapshotJson = JSON.stringify({
    worst: check.worst,
    findings: check.findings,
    catalogueVersion: checklist.version,
    itemKeys: checklist.items.map((i) => i.key),
  });
  const C = COUNTS;
  const R0 = BASE; // reviewers: BASE+1 … BASE+5000
  const H0 = HOMEOWNER_BASE;
  const run = (sql: string, bindings: Knex.RawBinding[] = []) => knex.raw(sql, bindings);

  await run("SET SESSION foreign_key_checks = 0, unique_checks = 0");
  await run(
    `INSERT INTO users (id, email, password_hash, role, display_name, email_verified_at, created_at)
     SELECT ? + seq, CONCAT('reviewer', seq, '@bench.loopwright.test'), ?, 'reviewer',
            CONCAT('Bench reviewer ', seq), NOW(3), NOW(3) - INTERVAL seq MINUTE
     FROM seq_1_to_${C.reviewers}`,
    [R0, hash],
  );
  await run(
    `INSERT INTO users (id, email, password_hash, role, display_name, email_verified_at, created_at)
     SELECT ? + seq, CONCAT('homeowner', seq, '@bench.loopwright.test'), ?, 'homeowner',
            CONCAT('Bench homeowner ', seq), NOW(3), NOW(3) - INTERVAL seq MINUTE
     FROM seq_1_to_${C.homeowners}`,
    [H0, hash],
  );
  await run(
    `INSERT INTO reviewer_profiles (user_id, trading_name, bio, years_in_trade, specialisms, region,
            centre_lat, centre_lng, travel_radius_km, hourly_rate_minor, currency)
     SELECT ? + seq, CONCAT('Bench Heating ', seq), 'Solar thermal and unvented cylinders.',
            seq % 30, '[]', ELT(1 + seq % ${nRegions}, ${regions}),
            50.2 + (seq % 800) / 100, -5.2 + (seq % 600) / 100, 80, 5000 + (seq % 40) * 100, 'GBP'
     FROM seq_1_to_${C.reviewers}`,
    [R0],
  );
  const kinds = REQUIRED_CREDENTIAL_KINDS.map((k) => knex.raw("?", [k]).toQuery()).join(",");
  await run(
    `INSERT INTO credentials (reviewer_id, kind, issuer, number, expires_on, status, reviewed_at)
     SELECT ? + r.seq, ELT(k.seq, ${kinds}), 'Bench issuer', CONCAT('B-', r.seq, '-', k.seq),
            CURDATE() + INTERVAL 1 YEAR, IF(r.seq % 10 = 0, 'pending', 'verified'), NOW(3)
     FROM seq_1_to_${C.reviewers} r JOIN seq_1_to_${REQUIRED_CREDENTIAL_KINDS.length} k`,
    [R0],
  );
  await run(
    `INSERT INTO projects (id, owner_id, title, system, region, collector_type, collector_area_m2,
            worst_level, status, created_at)
     SELECT ? + seq, ? + 1 + (seq - 1) % ${C.homeowners}, CONCAT('Bench project ', seq), ?,
            ELT(1 + seq % ${nRegions}, ${regions}), IF(seq % 2, 'evacuated_tube', 'flat_plate'),
            3 + seq % 5, ELT(1 + seq % 4, 'ok', 'note', 'fix', 'stop'), 'ready',
            NOW(3) - INTERVAL seq * 7 MINUTE
     FROM seq_1_to_${C.projects}`,
    [BASE, H0, systemJson],
  );
  // Request seq 1…20,000 is the newest request of project seq (open unless seq % 10 = 0);
  // the older ones are awarded (a quarter), cancelled or expired.
  await run(
    `INSERT INTO requests (id, project_id, homeowner_id, kind, status, questions, budget_min_minor,
            budget_max_minor, currency, region, collector_type, site_lat, site_lng, window_start,
            window_end, expires_at, created_at, system_snapshot, loop_check_snapshot)
     SELECT ? + seq, ? + 1 + (seq - 1) % ${C.projects}, ? + 1 + (seq - 1) % ${C.homeowners},
            IF(seq % 3 = 0, 'site_visit', 'remote_check'),
            CASE WHEN seq <= ${C.projects} AND seq % 10 <> 0 THEN 'open'
                 WHEN seq % 4 = 0 THEN 'awarded' WHEN seq % 4 = 1 THEN 'cancelled' ELSE 'expired' END,
            CONCAT('Please check the vessel size for this loop (bench request ', seq, ')'),
            5000 + (seq % 20) * 1000, 10000 + (seq % 37) * 1000, 'GBP',
            ELT(1 + seq % ${nRegions}, ${regions}), IF(seq % 2, 'evacuated_tube', 'flat_plate'),
            IF(seq % 3 = 0, 50.1 + (seq * 7 % 800) / 100, NULL),
            IF(seq % 3 = 0, -5.5 + (seq * 13 % 700) / 100, NULL),
            IF(seq % 3 = 0, CURDATE() + INTERVAL (seq % 90) DAY, NULL),
            IF(seq % 3 = 0, CURDATE() + INTERVAL (seq % 90) + 30 DAY, NULL),
            IF(seq <= ${C.projects}, NOW(3) + INTERVAL (1 + seq % 29) DAY, NOW(3) - INTERVAL seq MINUTE),
            NOW(3) - INTERVAL seq * 3 MINUTE,
            ?, ?
     FROM seq_1_to_${C.requests}`,
    [BASE, BASE, H0, systemJson, snapshotJson],
  );
  // Three quotes per request from three different reviewers; quote id = BASE + (r-1)*3 + k.
  await run(
    `INSERT INTO quotes (id, request_id, reviewer_id, price_minor, currency, turnaround_days,
            scope_md, status, created_at)
     SELECT ? + (r.seq - 1) * 3 + k.seq, ? + r.seq,
            ? + 1 + (r.seq * 7 + k.seq * 1667) % ${C.reviewers},
            8000 + ((r.seq + k.seq) % 30) * 500, 'GBP', 2 + k.seq,
            'I will check the vessel, the fill pressure and the relief valve.',
            CASE WHEN q.status = 'open' THEN 'live'
                 WHEN q.status = 'awarded' AND k.seq = 1 THEN 'accepted'
                 WHEN q.status = 'awarded' THEN 'declined' ELSE 'withdrawn' END,
            q.created_at + INTERVAL k.seq HOUR
     FROM seq_1_to_${C.requests} r JOIN seq_1_to_3 k JOIN requests q ON q.id = ? + r.seq`,
    [BASE, BASE, R0, BASE],
  );
  await run(
    `INSERT INTO message_threads (id, request_id, reviewer_id, last_message_at, created_at)
     SELECT ? + seq, ? + seq, ? + 1 + (seq * 7 + 1667) % ${C.reviewers}, NOW(3), NOW(3)
     FROM seq_1_to_${C.threads}`,
    [BASE, BASE, R0],
  );
  await run(
    `INSERT INTO messages (thread_id, sender_id, body_md, created_at)
     SELECT ? + t.seq, IF(m.seq = 1, r.homeowner_id, th.reviewer_id),
            IF(m.seq = 1, 'Could you look at the vessel size first.', 'Yes: **send a photo** of the label.'),
            NOW(3) - INTERVAL (3 - m.seq) HOUR
     FROM seq_1_to_${C.threads} t JOIN seq_1_to_${C.messagesPerThread} m
     JOIN message_threads th ON th.id = ? + t.seq JOIN requests r ON r.id = th.request_id`,
    [BASE, BASE],
  );
  await run(
    `INSERT INTO jobs (id, request_id, quote_id, homeowner_id, reviewer_id, state, amount_minor,
            fee_minor, currency, funded_at, delivered_at, closed_at, created_at)
     SELECT q.id, r.id, q.id, r.homeowner_id, q.reviewer_id,
            ELT(1 + r.id % 5, 'awaiting_payment', 'funded', 'in_review', 'delivered', 'released'),
            q.price_minor, ROUND(q.price_minor * 0.12), 'GBP',
            IF(r.id % 5 = 0, NULL, r.created_at + INTERVAL 1 DAY),
            IF(r.id % 5 >= 3, r.created_at + INTERVAL 3 DAY, NULL),
            IF(r.id % 5 = 4, r.created_at + INTERVAL 10 DAY, NULL), r.created_at + INTERVAL 1 DAY
     FROM requests r JOIN quotes q ON q.request_id = r.id AND q.status = 'accepted'
     WHERE r.status = 'awarded' AND r.id > ?`,
    [BASE],
  );
  await run(
    `INSERT INTO ledger_entries (job_id, kind, amount_minor, currency, provider_ref, idempotency_key, created_at)
     SELECT j.id, ELT(k.seq, 'charge', 'fee'), IF(k.seq = 1, j.amount_minor, -j.fee_minor), 'GBP',
            CONCAT('bench_', j.id), CONCAT('bench:', j.id, ':', k.seq), j.funded_at
     FROM jobs j JOIN seq_1_to_2 k WHERE j.funded_at IS NOT NULL AND j.id > ?`,
    [BASE],
  );
  // The demo's first verified reviewer signs in for the bench: give it a centre point in the
  // middle of the generated sites, so the distance sort and filter have something to measure.
  await run(
    `UPDATE reviewer_profiles SET centre_lat = 52.5, centre_lng = -2.0
     WHERE user_id = (SELECT id FROM users WHERE email = ?)`,
    [DEMO_USERS.reviewers[0].email],
  );
  // BENCH HOOK (review workspace): once the checklist-answer tables land, add the generated
  // answers here (e.g. one row per catalogue item for each in_review/delivered job's report),
  // and the checklist-item autosave POST to the routes in tests/bench/run.ts.
  await run("SET SESSION foreign_key_checks = 1, unique_checks = 1");
  await run("ANALYZE TABLE users, reviewer_profiles, projects, requests, quotes, jobs");

  const rows: Record<string, number> = {};
  for (const t of [
    "users",
    "reviewer_profiles",
    "credentials",
    "projects",
    "requests",
    "quotes",
    "message_threads",
    "messages",
    "jobs",
    "ledger_entries",
  ]) {
    const [r] = await knex(t).count({ n: "*" });
    rows[t] = Number(r!.n);
  }
  const [open] = await knex("requests").where({ status: "open" }).count({ n: "*" });
  rows.open_requests = Number(open!.n);
  return { seconds: (performance.now() - t0) / 1000, rows };
}
