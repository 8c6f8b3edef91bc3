import type { Knex } from "knex";
import { CONSENT_DECISIONS, STORY_ITEM_KINDS, STORY_STATUSES } from "../../lib/portfolio";

// The public portfolio: what a shop says about itself on its public page, the stories of finished
// jobs, the shared entries each story shows (in order), and every consent decision of the
// machine's owner (given, refused, withdrawn) with who, when, from where. A story is public only
// while its status is "published", which needs the owner's consent; withdrawing it changes the
// status in the same transaction as the decision is recorded.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("shop_profiles", (t) => {
    t.integer("shop_id").unsigned().primary().references("shops.id").onDelete("CASCADE");
    // How the name reads in public (e.g. without "LLC"); the shop's own name when null.
    t.string("display_name", 120).nullable();
    t.string("about", 2000).nullable();
    // A storage key (lib/server/storage.ts) of a re-encoded, metadata-free JPEG.
    t.string("logo_key", 255).nullable();
    // Location in the shop's own words ("East side of Harlow, by the feed store"), shown only when chosen.
    t.string("location_text", 200).nullable();
    t.boolean("show_location").notNullable().defaultTo(false);
    t.string("public_email", 254).nullable();
    t.string("public_phone", 40).nullable();
    t.timestamp("updated_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
  });

  await knex.schema.createTable("stories", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.integer("job_id").unsigned().notNullable();
    t.string("slug", 80).notNullable();
    t.string("title", 120).notNullable();
    // tiptap JSON checked by parseNote (lib/rich-text/note.ts).
    t.json("write_up").nullable();
    t.bigInteger("cover_photo_id").unsigned().nullable().references("photos.id").onDelete("SET NULL");
    t.enum("status", [...STORY_STATUSES]).notNullable().defaultTo("proposed");
    // Bumped on every change: the public page's cache key, and the curation form's edit check.
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.integer("proposed_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.integer("published_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("published_at", { precision: 3 }).nullable();
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("updated_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.unique(["shop_id", "id"]);
    t.unique(["shop_id", "slug"]);
    // One story per job.
    t.unique(["shop_id", "job_id"]);
    t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
    // The shop's public grid and the sitemap: published stories, newest first.
    t.index(["shop_id", "status", "published_at"]);
    t.index(["status", "published_at"]);
  });

  await knex.schema.createTable("story_items", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.bigInteger("story_id").unsigned().notNullable();
    t.smallint("position").unsigned().notNullable();
    t.enum("kind", [...STORY_ITEM_KINDS]).notNullable();
    // The shared entry shown; null only for the reassembly checklist, which is the job's, not an entry's.
    t.bigInteger("entry_id").unsigned().nullable();
    // One photo of a photo set ("photo" items).
    t.bigInteger("photo_id").unsigned().nullable().references("photos.id").onDelete("CASCADE");
    // Where a clip starts playing ("clip" items), in milliseconds.
    t.integer("moment_ms").unsigned().nullable();
    // The curator's words for the public; entry captions were written for the owner and stay private.
    t.string("caption", 300).nullable();
    t.foreign(["shop_id", "story_id"]).references(["shop_id", "id"]).inTable("stories").onDelete("CASCADE");
    t.foreign(["shop_id", "entry_id"]).references(["shop_id", "id"]).inTable("journal_entries").onDelete("CASCADE");
    t.index(["story_id", "position"]);
    t.index(["photo_id"]);
  });

  await knex.schema.createTable("story_consents", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.bigInteger("story_id").unsigned().notNullable();
    t.integer("user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.string("name_typed", 120).notNullable();
    t.enum("decision", [...CONSENT_DECISIONS]).notNullable();
    t.timestamp("decided_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.string("ip", 64).notNullable();
    t.string("user_agent", 500).nullable();
    t.foreign(["shop_id", "story_id"]).references(["shop_id", "id"]).inTable("stories").onDelete("CASCADE");
    t.index(["story_id", "id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("story_consents");
  await knex.schema.dropTable("story_items");
  await knex.schema.dropTable("stories");
  await knex.schema.dropTable("shop_profiles");
}
