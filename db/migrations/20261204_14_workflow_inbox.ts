import type { Knex } from "knex";

// The job follows its events, and the desk hears about them.
// - job_status_changes.cause: which event moved the job ("manual" for a hand move), so the
//   history can say "moved because the owner answered".
// - job_parts.finding_id / no_ok_needed: a part waits the job only for work the owner has
//   authorised (its finding's request approved) or that staff marked as needing no OK.
// - shop_events: one row per thing that happened in a shop, with a monotonic id. The desk inbox
//   reads it, and every app instance's live stream polls it (never an in-process bus), so a
//   client connected to instance B hears what instance A wrote.
// - inbox_reads: per person, which inbox items they have read.
// - inbox_preferences: per person and kind, e-mail now, in a daily digest, or not by e-mail;
//   inbox_digests: how far each person's digest has got.
// - shops.owner_wait_days: after how many days waiting on the owner a job needs attention.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("job_status_changes", (t) => {
    t.string("cause", 40).notNullable().defaultTo("manual");
  });
  await knex.schema.alterTable("job_parts", (t) => {
    t.bigInteger("finding_id").unsigned().nullable();
    t.boolean("no_ok_needed").notNullable().defaultTo(false);
    // One column, so deleting a draft finding can clear it (shop_id can't be set to null); the
    // writer checks the finding is on the part's own job.
    t.foreign(["finding_id"]).references(["id"]).inTable("findings").onDelete("SET NULL");
  });
  // Parts recorded before this rule existed were all treated as cleared; keep them so.
  await knex("job_parts").update({ no_ok_needed: true });
  await knex.schema.alterTable("shops", (t) => {
    t.smallint("owner_wait_days").unsigned().notNullable().defaultTo(3);
  });

  await knex.schema.createTable("shop_events", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable().references("shops.id").onDelete("CASCADE");
    t.integer("job_id").unsigned().nullable();
    t.string("kind", 40).notNullable();
    // An item for the desk inbox (owner answered, payment, consent…), or only a change the live
    // views refresh on (a status move, a new entry).
    t.boolean("inbox").notNullable().defaultTo(false);
    // Whether the job's owner and followers may hear of it (their page refreshes on it).
    t.boolean("owner_visible").notNullable().defaultTo(false);
    // A short summary for the inbox line; never more than the staff may see anyway.
    t.json("payload").notNullable();
    t.integer("actor_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
    t.index(["shop_id", "inbox", "id"]);
    t.index(["job_id", "id"]);
  });

  await knex.schema.createTable("inbox_reads", (t) => {
    t.integer("user_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.bigInteger("event_id").unsigned().notNullable().references("shop_events.id").onDelete("CASCADE");
    t.timestamp("read_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.primary(["user_id", "event_id"]);
  });

  await knex.schema.createTable("inbox_preferences", (t) => {
    t.integer("user_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.integer("shop_id").unsigned().notNullable().references("shops.id").onDelete("CASCADE");
    t.string("kind", 40).notNullable();
    t.enum("delivery", ["now", "digest", "off"]).notNullable();
    t.primary(["user_id", "shop_id", "kind"]);
  });

  await knex.schema.createTable("inbox_digests", (t) => {
    t.integer("user_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.integer("shop_id").unsigned().notNullable().references("shops.id").onDelete("CASCADE");
    // Items up to this id are in a digest already.
    t.bigInteger("through_event_id").unsigned().notNullable().defaultTo(0);
    t.date("last_sent_on").nullable();
    t.primary(["user_id", "shop_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("inbox_digests");
  await knex.schema.dropTable("inbox_preferences");
  await knex.schema.dropTable("inbox_reads");
  await knex.schema.dropTable("shop_events");
  await knex.schema.alterTable("shops", (t) => {
    t.dropColumn("owner_wait_days");
  });
  await knex.schema.alterTable("job_parts", (t) => {
    t.dropForeign(["finding_id"]);
    t.dropColumn("finding_id");
    t.dropColumn("no_ok_needed");
  });
  await knex.schema.alterTable("job_status_changes", (t) => {
    t.dropColumn("cause");
  });
}
