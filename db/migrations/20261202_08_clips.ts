import type { Knex } from "knex";

// Bench clips. The video service holds the media; we keep which upload/asset belongs to which
// job and entry, what state it is in, and every webhook event id we have handled (so a
// redelivered event has no second effect).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("shops", (t) => {
    // Shop settings for clips: defaults 10 minutes and 2 GB.
    t.integer("clip_max_seconds").unsigned().notNullable().defaultTo(600);
    t.bigInteger("clip_max_bytes").unsigned().notNullable().defaultTo(2 * 1024 * 1024 * 1024);
  });

  await knex.schema.createTable("clips", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.specificType("public_id", "char(22)").notNullable().unique();
    t.integer("shop_id").unsigned().notNullable();
    t.integer("job_id").unsigned().notNullable();
    t.bigInteger("entry_id").unsigned().notNullable();
    t.integer("uploaded_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.string("original_name", 255).nullable();
    t.bigInteger("bytes").unsigned().notNullable();
    t.string("upload_id", 64).notNullable().unique();
    t.string("asset_id", 64).nullable().unique();
    t.string("playback_id", 64).nullable();
    t.enum("status", ["uploading", "processing", "ready", "errored", "deleted"]).notNullable().defaultTo("uploading");
    t.decimal("duration_seconds", 10, 3).nullable();
    t.string("aspect_ratio", 16).nullable();
    t.string("error", 500).nullable();
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("updated_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
    t.foreign(["shop_id", "entry_id"]).references(["shop_id", "id"]).inTable("journal_entries").onDelete("CASCADE");
    t.unique(["shop_id", "id"]);
    t.index(["entry_id"]);
  });

  // Moments staff mark in a clip ("slider wear here" at 0:42): links that open it at that second.
  await knex.schema.createTable("clip_moments", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.bigInteger("clip_id").unsigned().notNullable();
    t.integer("at_ms").unsigned().notNullable();
    t.string("label", 120).notNullable();
    t.integer("created_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.foreign(["shop_id", "clip_id"]).references(["shop_id", "id"]).inTable("clips").onDelete("CASCADE");
    t.index(["clip_id", "at_ms"]);
  });

  await knex.schema.createTable("video_webhook_events", (t) => {
    t.string("event_id", 64).primary();
    t.string("type", 64).notNullable();
    t.timestamp("received_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("video_webhook_events");
  await knex.schema.dropTable("clip_moments");
  await knex.schema.dropTable("clips");
  await knex.schema.alterTable("shops", (t) => {
    t.dropColumn("clip_max_bytes");
    t.dropColumn("clip_max_seconds");
  });
}
