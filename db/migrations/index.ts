import type { Knex } from "knex";
import * as accounts from "./20261201_0001_accounts";
import * as marketplace from "./20261201_0002_marketplace";
import * as jobsAndMoney from "./20261201_0003_jobs_and_money";
import * as operations from "./20261201_0004_operations";
import * as requestSnapshots from "./20261202_0010_request_snapshots";
import * as payments from "./20261202_0011_payments";
import * as thumbnails from "./20261202_0012_thumbnails";
import * as rateLimits from "./20261202_0020_rate_limits";
import * as sessionVersion from "./20261202_0021_session_version";
import * as review from "./20261202_0030_review";
import * as mailAttachments from "./20261202_0050_mail_attachments";
import * as boardIndexes from "./20261202_0080_board_indexes";
import * as boardDistanceIndex from "./20261202_0081_board_distance_index";

/**
 * Every migration, in order. Listed here rather than read from the folder so the same source
 * works under tsx, vitest and any bundler (knex's folder loader needs a native TS loader).
 * Add a new migration file and its line below; the names are the ones stored in knex_migrations.
 */
const MIGRATIONS: Record<string, Knex.Migration> = {
  "20261201_0001_accounts.ts": accounts,
  "20261201_0002_marketplace.ts": marketplace,
  "20261201_0003_jobs_and_money.ts": jobsAndMoney,
  "20261201_0004_operations.ts": operations,
  "20261202_0010_request_snapshots.ts": requestSnapshots,
  "20261202_0011_payments.ts": payments,
  "20261202_0012_thumbnails.ts": thumbnails,
  "20261202_0020_rate_limits.ts": rateLimits,
  "20261202_0021_session_version.ts": sessionVersion,
  "20261202_0030_review.ts": review,
  "20261202_0050_mail_attachments.ts": mailAttachments,
  "20261202_0080_board_indexes.ts": boardIndexes,
  "20261202_0081_board_distance_index.ts": boardDistanceIndex,
};

export const migrationSource: Knex.MigrationSource<string> = {
  getMigrations: async () => Object.keys(MIGRATIONS),
  getMigrationName: (name) => name,
  getMigration: async (name) => {
    const m = MIGRATIONS[name];
    if (!m) throw new Error(`unknown migration ${name}`);
    return m;
  },
};
