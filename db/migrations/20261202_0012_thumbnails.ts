import type { Knex } from "knex";

/**
 * Images are re-encoded on ingest (lib/uploads/reencode.ts): the stored file is the clean copy,
 * and a small WebP thumbnail for pages is stored beside it under its own key.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("attachments", (t) => {
    t.string("thumbnail_key", 128).nullable().unique().after("file_key");
    t.smallint("width_px").unsigned().nullable().after("size_bytes");
    t.smallint("height_px").unsigned().nullable().after("width_px");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("attachments", (t) => {
    t.dropUnique(["thumbnail_key"]);
    t.dropColumn("thumbnail_key");
    t.dropColumn("width_px");
    t.dropColumn("height_px");
  });
}
