import type { Knex } from "knex";
import { alterTableKeepingFulltext } from "../ddl";

// Issue 21 §1–3: text messages to machine owners.
// - shops: the shop's own sender number (E.164; null: SMS_DEFAULT_FROM) and its quiet hours as
//   minutes after midnight on the shop's clock (default 21:00–08:00, after 47 CFR § 64.1200(c)(1),
//   followed for service texts as common carrier practice).
// - customers: which way the owner wants notices (e-mail, text or both), and their text consent as it
//   stands: the number agreed to, when and how (at check-in, on their own page, by texting START), and
//   an opt-out (STOP, or their page) that holds until they agree again. Every change is also kept in
//   text_consent_log (who, when, how).
// - text_outbox: texts waiting to go and sent, like the mail outbox (claimed with a lease, retried,
//   dead-lettered), with the service's message sid and delivery status from its signed callbacks.
//   `ref` is ours, carried in the status-callback URL: it ties a callback to the row even when the
//   answer to the send was lost, so the row is not sent twice.
// - text_status_events: each (message, status) callback applied once; a replay changes nothing.
// - sign_in_links.next_path: where a sign-in link leads once used. A text's link (/t/<token>) is one
//   of these: the approval request it opens is stored here rather than spelt out in the text.
// - text_inbound: every text received, by the service's sid (unique: a retried webhook files once),
//   with what was done with it (keyword, question on a job, or kept unmatched).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("shops", (t) => {
    t.string("sms_from", 16).nullable();
    t.smallint("sms_quiet_start").unsigned().notNullable().defaultTo(21 * 60);
    t.smallint("sms_quiet_end").unsigned().notNullable().defaultTo(8 * 60);
  });
  await knex.raw("ALTER TABLE shops ADD CONSTRAINT shops_sms_quiet CHECK (sms_quiet_start < 1440 AND sms_quiet_end < 1440)");

  // customers has the board's stopword-free FULLTEXT index: keep it so through the rebuild.
  await alterTableKeepingFulltext(knex, "customers", (t) => {
    t.enum("notify_channels", ["email", "text", "both"]).notNullable().defaultTo("email");
    t.string("text_consent_phone", 16).nullable();
    t.timestamp("text_consent_at", { precision: 3 }).nullable();
    t.enum("text_consent_how", ["check_in", "owner_page", "start_keyword"]).nullable();
    t.timestamp("text_opt_out_at", { precision: 3 }).nullable();
    t.enum("text_opt_out_how", ["stop_keyword", "owner_page", "carrier"]).nullable();
    // Inbound texts find their sender by number within the shop.
    t.index(["shop_id", "text_consent_phone"]);
  });

  await knex.schema.alterTable("sign_in_links", (t) => {
    t.string("next_path", 300).nullable();
  });

  await knex.schema.createTable("text_consent_log", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.integer("customer_id").unsigned().notNullable();
    t.string("phone", 16).notNullable();
    t.enum("action", ["granted", "revoked"]).notNullable();
    t.enum("how", ["check_in", "owner_page", "start_keyword", "stop_keyword", "carrier"]).notNullable();
    t.integer("user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.foreign(["shop_id", "customer_id"]).references(["shop_id", "id"]).inTable("customers").onDelete("CASCADE");
    t.index(["shop_id", "customer_id", "id"]);
  });

  await knex.schema.createTable("text_outbox", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.integer("job_id").unsigned().nullable();
    t.integer("customer_id").unsigned().nullable();
    t.string("kind", 40).notNullable();
    // Keyword answers (STOP, HELP…) go at once and to an opted-out number: the one confirmation allowed.
    t.enum("purpose", ["notice", "keyword_reply"]).notNullable().defaultTo("notice");
    t.string("to_phone", 16).notNullable();
    t.string("from_phone", 16).notNullable();
    t.string("body", 1600).notNullable();
    t.enum("state", ["queued", "sending", "retrying", "sent", "dead"]).notNullable().defaultTo("queued");
    t.enum("delivery", ["queued", "sent", "delivered", "undelivered", "failed"]).nullable();
    t.integer("attempts").unsigned().notNullable().defaultTo(0);
    t.timestamp("next_attempt_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("locked_until", { precision: 3 }).nullable();
    t.specificType("claim_token", "char(36)").nullable();
    t.specificType("ref", "char(32)").notNullable().unique();
    t.string("dedupe_key", 190).nullable();
    t.string("provider_sid", 40).nullable().unique();
    t.integer("error_code").nullable();
    t.string("last_error", 500).nullable();
    // Why it waits (quiet hours), shown in the sent log.
    t.string("held_reason", 120).nullable();
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("sent_at", { precision: 3 }).nullable();
    t.timestamp("delivered_at", { precision: 3 }).nullable();
    t.unique(["shop_id", "id"]);
    t.unique(["shop_id", "dedupe_key"]);
    t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
    t.foreign(["shop_id", "customer_id"]).references(["shop_id", "id"]).inTable("customers").onDelete("CASCADE");
    t.index(["state", "next_attempt_at"]);
    t.index(["shop_id", "job_id", "id"]);
  });

  await knex.schema.createTable("text_status_events", (t) => {
    t.string("provider_sid", 40).notNullable();
    t.string("status", 20).notNullable();
    t.timestamp("received_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.primary(["provider_sid", "status"]);
  });

  await knex.schema.createTable("text_inbound", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.string("provider_sid", 40).notNullable().unique();
    t.integer("shop_id").unsigned().nullable().references("shops.id").onDelete("CASCADE");
    t.integer("customer_id").unsigned().nullable();
    t.integer("job_id").unsigned().nullable();
    t.string("from_phone", 16).notNullable();
    t.string("to_phone", 16).notNullable();
    t.string("body", 1600).notNullable();
    t.enum("filed", ["stop", "start", "help", "question", "unmatched"]).notNullable();
    t.timestamp("received_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.foreign(["shop_id", "customer_id"]).references(["shop_id", "id"]).inTable("customers").onDelete("CASCADE");
    t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
    t.index(["shop_id", "received_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("text_inbound");
  await knex.schema.dropTable("text_status_events");
  await knex.schema.dropTable("text_outbox");
  await knex.schema.dropTable("text_consent_log");
  await knex.schema.alterTable("sign_in_links", (t) => {
    t.dropColumn("next_path");
  });
  await alterTableKeepingFulltext(knex, "customers", (t) => {
    t.dropIndex(["shop_id", "text_consent_phone"]);
    t.dropColumns("notify_channels", "text_consent_phone", "text_consent_at", "text_consent_how", "text_opt_out_at", "text_opt_out_how");
  });
  await knex.raw("ALTER TABLE shops DROP CONSTRAINT shops_sms_quiet");
  await knex.schema.alterTable("shops", (t) => {
    t.dropColumns("sms_from", "sms_quiet_start", "sms_quiet_end");
  });
}
