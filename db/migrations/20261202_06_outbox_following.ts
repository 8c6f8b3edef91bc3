import type { Knex } from "knex";
import { FREQUENCIES, SUBSCRIBER_ROLES } from "../../lib/following";

// Mail goes through an outbox: a row written in the same transaction as the change that causes
// it, sent later by the worker (lib/server/outbox-worker.ts), so mail is neither lost when a send
// fails nor sent for a change that rolled back. Job followers, and the two queues that turn
// timeline changes into mail: shared entries waiting for the digest window, and alerts that go
// out at once (ready to collect, approval requests, invitations).
const OUTBOX_STATES = ["queued", "sending", "retrying", "sent", "dead"] as const;

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("shops", (t) => {
    // Entries shared within this many minutes of the first go out as one e-mail.
    t.smallint("digest_window_minutes").unsigned().notNullable().defaultTo(15);
  });

  await knex.schema.createTable("outbox", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().nullable().references("shops.id").onDelete("CASCADE");
    // shop_id, or 0 for mail of no shop: NULLs never collide in a unique index, 0 does.
    t.integer("dedupe_scope").unsigned().notNullable().defaultTo(0);
    t.string("dedupe_key", 190).nullable();
    t.string("kind", 40).notNullable();
    // Fixed when queued: a retry must send exactly the same request (idempotency keys compare bodies).
    t.string("from_address", 320).notNullable();
    t.string("to_email", 254).notNullable();
    t.string("reply_to", 254).nullable();
    t.string("subject", 300).notNullable();
    t.specificType("html", "mediumtext").notNullable();
    t.specificType("text", "mediumtext").notNullable();
    t.json("headers").nullable();
    t.specificType("idempotency_key", "char(36)").notNullable().unique();
    t.enum("state", [...OUTBOX_STATES]).notNullable().defaultTo("queued");
    t.smallint("attempts").unsigned().notNullable().defaultTo(0);
    // When the row may next be claimed: the first send, the next retry, or the end of a lease.
    t.timestamp("next_attempt_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("locked_until", { precision: 3 }).nullable();
    t.specificType("claim_token", "char(36)").nullable();
    t.string("last_error", 500).nullable();
    t.string("provider_id", 100).nullable();
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("sent_at", { precision: 3 }).nullable();
    t.unique(["dedupe_scope", "dedupe_key"]);
    t.index(["state", "next_attempt_at"]);
    t.index(["shop_id", "state", "id"]);
  });

  await knex.schema.createTable("job_subscribers", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.integer("job_id").unsigned().notNullable();
    t.string("email", 254).notNullable();
    // Set once the person signs in (a follower may have no account when invited).
    t.integer("user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.enum("role", [...SUBSCRIBER_ROLES]).notNullable();
    t.enum("frequency", [...FREQUENCIES]).notNullable().defaultTo("every");
    t.timestamp("unsubscribed_at", { precision: 3 }).nullable();
    t.integer("invited_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.unique(["job_id", "email"]);
    t.unique(["shop_id", "id"]);
    t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
    t.index(["user_id"]);
    t.index(["email"]);
  });
  // Jobs still in the shop when this ships: their owners follow them, as new jobs' owners do.
  await knex.raw(
    `INSERT INTO job_subscribers (shop_id, job_id, email, user_id, role)
     SELECT j.shop_id, j.id, LOWER(c.email), c.user_id, 'owner' FROM jobs j JOIN customers c ON c.id = j.customer_id
     WHERE c.email IS NOT NULL AND j.status <> 'picked_up'`,
  );

  // One row per entry that became shared; the sweep marks it per kind of reader.
  await knex.schema.createTable("job_update_queue", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.integer("job_id").unsigned().notNullable();
    t.bigInteger("entry_id").unsigned().notNullable().unique();
    t.timestamp("shared_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("every_sent_at", { precision: 3 }).nullable();
    t.timestamp("daily_sent_at", { precision: 3 }).nullable();
    t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
    t.foreign(["shop_id", "entry_id"]).references(["shop_id", "id"]).inTable("journal_entries").onDelete("CASCADE");
    t.index(["every_sent_at", "job_id", "shared_at"]);
    t.index(["daily_sent_at", "shop_id", "job_id", "shared_at"]);
  });

  await knex.schema.createTable("job_alerts", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.integer("job_id").unsigned().notNullable();
    t.string("kind", 32).notNullable();
    // Only for mail to one person (an invitation); otherwise every subscriber of the job.
    t.bigInteger("subscriber_id").unsigned().nullable();
    t.json("payload").nullable();
    t.string("dedupe_key", 190).nullable();
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("sent_at", { precision: 3 }).nullable();
    t.unique(["job_id", "dedupe_key"]);
    t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
    t.foreign(["shop_id", "subscriber_id"]).references(["shop_id", "id"]).inTable("job_subscribers").onDelete("CASCADE");
    t.index(["sent_at", "id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("job_alerts");
  await knex.schema.dropTable("job_update_queue");
  await knex.schema.dropTable("job_subscribers");
  await knex.schema.dropTable("outbox");
  await knex.schema.alterTable("shops", (t) => {
    t.dropColumn("digest_window_minutes");
  });
}
