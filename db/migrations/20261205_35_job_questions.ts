import type { Knex } from "knex";

// Issue 21 §4: questions on a job, asked by the machine's owner (on the job page, on a line of an
// approval request, by replying to a text or an e-mail) and answered by the desk.
// - job_questions: the job's thread, one row per message in order. `author` says which side wrote
//   it: an owner's message names the customer (and the sign-in, when there was one), a desk answer
//   the staff user. An answer points at the question it answers; a question is open until then
//   (`answered_at`), and `inbox_event_id` is the desk inbox item it raised, cleared on answer.
//   A question about a line of a request names the request and the snapshot's line number (lines
//   are numbered inside the sealed snapshot; they have no rows of their own).
//   `source_ref`: the provider's id of an inbound message (mail or text), unique per shop, so a
//   delivery retried by the provider files one question, not two.
// - job_reply_tokens: the per-job token in the reply-to address of mail about the job
//   (q-<token>@…), so a reply is filed on the right job without guessing from the subject.
//   Random and lower-case (mail systems may fold the case of an address).
// - mail_webhook_events: ids of the mail service's webhook deliveries already handled.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("job_questions", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.integer("job_id").unsigned().notNullable();
    t.enum("author", ["owner", "staff"]).notNullable();
    t.integer("customer_id").unsigned().nullable();
    t.integer("user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.text("body").notNullable();
    t.enum("via", ["page", "sms", "email"]).notNullable();
    t.bigInteger("approval_request_id").unsigned().nullable();
    t.smallint("line_no").unsigned().nullable();
    t.bigInteger("answers_question_id").unsigned().nullable();
    t.timestamp("answered_at", { precision: 3 }).nullable();
    t.bigInteger("inbox_event_id").unsigned().nullable();
    t.string("source_ref", 120).nullable();
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.unique(["shop_id", "id"]);
    t.unique(["shop_id", "source_ref"]);
    t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
    t.foreign(["shop_id", "customer_id"]).references(["shop_id", "id"]).inTable("customers").onDelete("CASCADE");
    t.foreign(["shop_id", "approval_request_id"]).references(["shop_id", "id"]).inTable("approval_requests").onDelete("CASCADE");
    t.foreign(["shop_id", "answers_question_id"]).references(["shop_id", "id"]).inTable("job_questions").onDelete("CASCADE");
    // The thread of a job, in order; open questions of a job.
    t.index(["shop_id", "job_id", "id"]);
    t.index(["shop_id", "job_id", "author", "answered_at"]);
  });
  await knex.raw("ALTER TABLE job_questions ADD CONSTRAINT job_questions_line CHECK ((approval_request_id IS NULL) = (line_no IS NULL))");

  await knex.schema.createTable("job_reply_tokens", (t) => {
    t.integer("shop_id").unsigned().notNullable();
    t.integer("job_id").unsigned().notNullable();
    t.specificType("token", "char(26)").notNullable().unique();
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.primary(["shop_id", "job_id"]);
    t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
  });

  await knex.schema.createTable("mail_webhook_events", (t) => {
    t.string("event_id", 64).primary();
    t.string("type", 64).notNullable();
    t.timestamp("received_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("mail_webhook_events");
  await knex.schema.dropTable("job_reply_tokens");
  await knex.schema.dropTable("job_questions");
}
