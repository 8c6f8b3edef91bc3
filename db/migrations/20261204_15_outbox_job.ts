import type { Knex } from "knex";

// Which job a mail is about, so the desk can read one job's sent log ("did they get it?").
// Null for mail of no job (sign-in links). Rows already queued are filled in from their dedupe
// keys, which name the job's subscriber, invoice, deposit, payment, request or story; a row
// whose key says nothing about a job stays null and is simply not in any job's log.
const INDEX = "outbox_job_log";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("outbox", (t) => {
    t.integer("job_id").unsigned().nullable().after("shop_id");
    // The log reads one job's rows newest first; it also serves the foreign key.
    t.index(["shop_id", "job_id", "id"], INDEX);
    t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
  });

  // Progress mail, daily digests and alerts: "every:…:<subscriber>", "daily:…:<subscriber>", "alert:<alert>:<subscriber>".
  await knex.raw(
    `UPDATE outbox o JOIN job_subscribers s ON s.shop_id = o.shop_id AND SUBSTRING_INDEX(o.dedupe_key, ':', -1) = CAST(s.id AS CHAR)
     SET o.job_id = s.job_id
     WHERE o.job_id IS NULL AND (o.dedupe_key LIKE 'every:%' OR o.dedupe_key LIKE 'daily:%' OR o.dedupe_key LIKE 'alert:%')`,
  );
  // Money mail (lib/server/invoice-mail.ts), approval requests and reminders (lib/server/approval-mail.ts), consent requests (lib/server/portfolio.ts).
  const byKey: [table: string, key: string][] = [
    ["invoices", "CONCAT('invoice:', x.public_id, ':issued')"],
    ["deposit_requests", "CONCAT('deposit:', x.public_id)"],
    ["payments", "CONCAT('receipt:', x.id)"],
    ["approval_requests", "CONCAT('approval:', x.public_id)"],
    ["approval_requests", "CONCAT('approval-reminder:', x.public_id)"],
    ["stories", "CONCAT('portfolio-consent:', x.id)"],
  ];
  for (const [table, key] of byKey) {
    await knex.raw(`UPDATE outbox o JOIN ?? x ON x.shop_id = o.shop_id AND o.dedupe_key = ${key} SET o.job_id = x.job_id WHERE o.job_id IS NULL`, [table]);
  }
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("outbox", (t) => {
    t.dropForeign(["shop_id", "job_id"]);
    t.dropIndex(["shop_id", "job_id", "id"], INDEX);
    t.dropColumn("job_id");
  });
}
