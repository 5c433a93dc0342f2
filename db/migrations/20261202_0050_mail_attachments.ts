import type { Knex } from "knex";

/**
 * Files sent with an e-mail (the site visit's calendar invitation): a JSON list of
 * { filename, contentType, content } written with the outbox row, so the worker sends exactly
 * what the change that queued it produced.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("email_outbox", (t) => {
    t.json("attachments").nullable().after("payload");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("email_outbox", (t) => t.dropColumn("attachments"));
}
