import type { Knex } from "knex";

/**
 * Each session token carries the user's session version; a token with an older version is no
 * longer a session. Sign-out and a suspension bump it in lib/data; a change of role or of password
 * bumps it here, in the database, whichever code makes the change.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("users", (t) => {
    t.integer("session_version").unsigned().notNullable().defaultTo(0);
  });
  await knex.raw(`
    CREATE TRIGGER users_end_sessions BEFORE UPDATE ON users FOR EACH ROW
    SET NEW.session_version = IF(
      NEW.role <> OLD.role OR NOT (NEW.password_hash <=> OLD.password_hash),
      OLD.session_version + 1,
      NEW.session_version
    )`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("DROP TRIGGER IF EXISTS users_end_sessions");
  await knex.schema.alterTable("users", (t) => {
    t.dropColumn("session_version");
  });
}
