import type { Knex } from "knex";

/** People, sign-in support, reviewer profiles and trade credentials. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("users", (t) => {
    t.bigIncrements("id").primary();
    t.string("email", 254).notNullable().unique();
    t.string("password_hash", 100).notNullable();
    t.enu("role", ["homeowner", "reviewer", "admin"]).notNullable();
    t.string("display_name", 100).notNullable();
    t.dateTime("email_verified_at", { precision: 3 }).nullable();
    t.boolean("notify_new_message").notNullable().defaultTo(true);
    t.boolean("notify_new_quote").notNullable().defaultTo(true);
    t.boolean("is_demo").notNullable().defaultTo(false);
    t.dateTime("created_at", { precision: 3 })
      .notNullable()
      .defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.dateTime("updated_at", { precision: 3 })
      .notNullable()
      .defaultTo(knex.raw("CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3)"));
    t.index(["role", "created_at"]);
  });

  // Single-use, expiring tokens for e-mail verification and password reset; only the hash is kept.
  await knex.schema.createTable("auth_tokens", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("user_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.enu("purpose", ["verify_email", "reset_password"]).notNullable();
    t.specificType("token_hash", "CHAR(64)").notNullable().unique();
    t.dateTime("expires_at", { precision: 3 }).notNullable();
    t.dateTime("used_at", { precision: 3 }).nullable();
    t.dateTime("created_at", { precision: 3 })
      .notNullable()
      .defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.index(["user_id", "purpose"]);
  });

  // Fixed-window counters shared by every app process (sign-in attempts per account and per address).
  await knex.schema.createTable("rate_limit_hits", (t) => {
    t.string("bucket", 191).notNullable();
    t.dateTime("window_start", { precision: 0 }).notNullable();
    t.integer("hits").unsigned().notNullable().defaultTo(0);
    t.primary(["bucket", "window_start"]);
    t.index(["window_start"]);
  });

  await knex.schema.createTable("reviewer_profiles", (t) => {
    t.bigInteger("user_id").unsigned().primary().references("users.id").onDelete("CASCADE");
    t.string("trading_name", 120).notNullable();
    t.text("bio").notNullable();
    t.smallint("years_in_trade").unsigned().notNullable().defaultTo(0);
    t.json("specialisms").notNullable();
    t.string("region", 64).notNullable();
    t.decimal("centre_lat", 9, 6).nullable();
    t.decimal("centre_lng", 9, 6).nullable();
    t.smallint("travel_radius_km").unsigned().nullable();
    t.integer("hourly_rate_minor").unsigned().nullable();
    t.specificType("currency", "CHAR(3)").notNullable().defaultTo("GBP");
    t.string("payment_account_id", 64).nullable().unique();
    t.boolean("payouts_enabled").notNullable().defaultTo(false);
    t.dateTime("suspended_at", { precision: 3 }).nullable();
    t.text("suspended_reason").nullable();
    t.dateTime("created_at", { precision: 3 })
      .notNullable()
      .defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.dateTime("updated_at", { precision: 3 })
      .notNullable()
      .defaultTo(knex.raw("CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3)"));
    t.index(["region"]);
  });

  // Every uploaded file: sketches, photos, credential evidence. Bytes live in the upload service.
  await knex.schema.createTable("attachments", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("owner_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.bigInteger("project_id").unsigned().nullable(); // FK added with projects
    t.enu("purpose", ["sketch", "photo", "credential_evidence"]).notNullable();
    t.string("file_key", 128).notNullable().unique();
    t.string("file_name", 255).notNullable();
    t.string("mime_type", 100).notNullable();
    t.integer("size_bytes").unsigned().notNullable();
    t.string("caption", 200).nullable();
    t.enu("tag", [
      "collector",
      "roof",
      "pump_station",
      "vessel",
      "cylinder",
      "pipework",
      "other",
    ]).nullable();
    t.dateTime("deleted_at", { precision: 3 }).nullable();
    t.dateTime("created_at", { precision: 3 })
      .notNullable()
      .defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.dateTime("updated_at", { precision: 3 })
      .notNullable()
      .defaultTo(knex.raw("CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3)"));
    t.index(["project_id", "purpose"]);
    t.index(["owner_id", "purpose"]);
  });

  await knex.schema.createTable("credentials", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("reviewer_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.enu("kind", [
      "solar_thermal_competence",
      "unvented_hot_water_competence",
      "water_regulations_competence",
      "public_liability_insurance",
      "trade_registration",
    ]).notNullable();
    t.string("issuer", 160).notNullable();
    t.string("number", 80).notNullable();
    t.date("expires_on").notNullable();
    t.bigInteger("evidence_attachment_id")
      .unsigned()
      .nullable()
      .references("attachments.id")
      .onDelete("SET NULL");
    t.enu("status", ["pending", "verified", "rejected", "expired"])
      .notNullable()
      .defaultTo("pending");
    t.text("admin_reason").nullable();
    t.bigInteger("reviewed_by").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.dateTime("reviewed_at", { precision: 3 }).nullable();
    t.dateTime("expiry_warned_at", { precision: 3 }).nullable();
    t.dateTime("created_at", { precision: 3 })
      .notNullable()
      .defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.dateTime("updated_at", { precision: 3 })
      .notNullable()
      .defaultTo(knex.raw("CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3)"));
    t.index(["status", "created_at"]);
    t.index(["reviewer_id", "kind"]);
    t.index(["status", "expires_on"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("credentials");
  await knex.schema.dropTable("attachments");
  await knex.schema.dropTable("reviewer_profiles");
  await knex.schema.dropTable("rate_limit_hits");
  await knex.schema.dropTable("auth_tokens");
  await knex.schema.dropTable("users");
}
