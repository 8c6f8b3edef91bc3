import type { Knex } from "knex";

// Invoices, deposits and payments. Money is integer minor units of the invoice's currency. Every
// payment belongs to its job (a parts deposit can come before any invoice); the job's one live
// invoice counts them all. Numbers are per shop, handed out under the shop row's lock like job
// numbers, so they have no gaps and no duplicates; a voided invoice keeps its number.
const LINE_KINDS = ["part", "labour", "fee"];

function jobChild(t: Knex.CreateTableBuilder) {
  t.integer("shop_id").unsigned().notNullable();
  t.integer("job_id").unsigned().notNullable();
  t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
}

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("shops", (t) => {
    t.integer("next_invoice_number").unsigned().notNullable().defaultTo(1);
  });

  await knex.schema.createTable("invoices", (t) => {
    t.bigIncrements("id").unsigned().primary();
    // Opaque id for the owner's links and the PDF address (numbers are guessable).
    t.specificType("public_id", "char(16)").notNullable().unique();
    jobChild(t);
    t.integer("number").unsigned().notNullable();
    t.enum("status", ["draft", "issued", "paid", "void"]).notNullable().defaultTo("draft");
    // The job id while the invoice is not void: the unique key allows one live invoice per job.
    t.integer("live_job_id").unsigned().nullable().unique();
    t.specificType("currency", "char(3)").notNullable();
    // The settings and breakdown the totals were worked out with (lib/invoices.ts), kept as issued.
    t.json("totals").notNullable();
    t.integer("subtotal_minor").notNullable().defaultTo(0);
    t.integer("discount_minor").notNullable().defaultTo(0);
    t.integer("supplies_minor").notNullable().defaultTo(0);
    t.integer("tax_minor").notNullable().defaultTo(0);
    t.integer("total_minor").notNullable().defaultTo(0);
    t.integer("paid_minor").notNullable().defaultTo(0);
    t.integer("balance_minor").notNullable().defaultTo(0);
    t.enum("discount_kind", ["amount", "percent"]).nullable();
    t.integer("discount_amount_minor").unsigned().nullable();
    t.decimal("discount_percent", 9, 6).nullable();
    t.string("returned_parts_note", 500).nullable();
    t.string("note", 1000).nullable();
    // Bumped on every change, so two people editing one draft can't overwrite each other unseen.
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.integer("created_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("issued_at", { precision: 3 }).nullable();
    t.integer("issued_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("paid_at", { precision: 3 }).nullable();
    t.timestamp("voided_at", { precision: 3 }).nullable();
    t.unique(["shop_id", "number"]);
    t.unique(["shop_id", "id"]);
    t.index(["shop_id", "job_id"]);
    t.index(["shop_id", "status", "issued_at"]);
  });

  await knex.schema.createTable("invoice_lines", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.bigInteger("invoice_id").unsigned().notNullable();
    t.smallint("position").unsigned().notNullable();
    // authorised: copied from an approved line of an answered request; added: typed on the invoice.
    t.enum("source", ["authorised", "added"]).notNullable();
    t.specificType("request_public_id", "char(16)").nullable();
    t.smallint("request_line_no").unsigned().nullable();
    t.enum("kind", LINE_KINDS).notNullable();
    t.string("description", 200).notNullable();
    t.string("part_number", 60).nullable();
    t.integer("qty_thousandths").unsigned().nullable();
    t.integer("unit_price_minor").unsigned().nullable();
    t.integer("hours_tenths").unsigned().nullable();
    t.integer("rate_minor").unsigned().nullable();
    t.integer("amount_minor").unsigned().nullable();
    t.boolean("taxable").notNullable();
    t.foreign(["shop_id", "invoice_id"]).references(["shop_id", "id"]).inTable("invoices").onDelete("CASCADE");
    t.index(["invoice_id", "position"]);
  });

  // A parts deposit the desk asks for (with an approval request, or on its own); paid online or at the counter.
  await knex.schema.createTable("deposit_requests", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.specificType("public_id", "char(16)").notNullable().unique();
    jobChild(t);
    t.specificType("request_public_id", "char(16)").nullable();
    t.integer("amount_minor").unsigned().notNullable();
    t.specificType("currency", "char(3)").notNullable();
    t.string("note", 500).nullable();
    t.enum("status", ["open", "paid", "cancelled"]).notNullable().defaultTo("open");
    t.integer("requested_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("requested_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("paid_at", { precision: 3 }).nullable();
    t.unique(["shop_id", "id"]);
    t.index(["shop_id", "job_id", "status"]);
  });

  // An online payment started by the owner: the hosted checkout session and what it was for.
  await knex.schema.createTable("payment_checkouts", (t) => {
    t.bigIncrements("id").unsigned().primary();
    jobChild(t);
    t.bigInteger("invoice_id").unsigned().nullable();
    t.bigInteger("deposit_id").unsigned().nullable();
    t.string("provider_session_id", 255).notNullable().unique();
    t.string("url", 2000).nullable();
    t.integer("amount_minor").unsigned().notNullable();
    t.specificType("currency", "char(3)").notNullable();
    t.enum("status", ["open", "complete", "expired"]).notNullable().defaultTo("open");
    t.integer("created_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("closed_at", { precision: 3 }).nullable();
    t.foreign(["shop_id", "invoice_id"]).references(["shop_id", "id"]).inTable("invoices").onDelete("CASCADE");
    t.foreign(["shop_id", "deposit_id"]).references(["shop_id", "id"]).inTable("deposit_requests").onDelete("CASCADE");
    t.index(["shop_id", "job_id", "status"]);
  });

  await knex.schema.createTable("payments", (t) => {
    t.bigIncrements("id").unsigned().primary();
    jobChild(t);
    t.bigInteger("invoice_id").unsigned().nullable();
    t.bigInteger("deposit_id").unsigned().nullable();
    t.enum("kind", ["payment", "deposit", "refund"]).notNullable();
    t.enum("method", ["online", "cash", "card_terminal", "cheque"]).notNullable();
    // Always positive: a refund's kind says which way the money went.
    t.integer("amount_minor").unsigned().notNullable();
    t.specificType("currency", "char(3)").notNullable();
    t.string("reference", 120).nullable();
    // The provider's ids: unique, so a payment or refund reported twice (webhook and API answer,
    // or a redelivered webhook) is recorded once.
    t.string("provider_payment_id", 255).nullable().unique();
    t.string("provider_refund_id", 255).nullable().unique();
    t.string("provider_session_id", 255).nullable();
    t.bigInteger("refund_of_payment_id").unsigned().nullable();
    t.integer("recorded_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("received_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.unique(["shop_id", "id"]);
    t.foreign(["shop_id", "invoice_id"]).references(["shop_id", "id"]).inTable("invoices").onDelete("CASCADE");
    t.foreign(["shop_id", "deposit_id"]).references(["shop_id", "id"]).inTable("deposit_requests").onDelete("CASCADE");
    t.foreign(["shop_id", "refund_of_payment_id"]).references(["shop_id", "id"]).inTable("payments").onDelete("CASCADE");
    t.index(["shop_id", "job_id", "received_at"]);
  });

  // Every webhook event applied, by the provider's event id: a redelivery finds its id here.
  await knex.schema.createTable("payment_webhook_events", (t) => {
    t.string("event_id", 255).primary();
    t.string("type", 64).notNullable();
    t.timestamp("received_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("payment_webhook_events");
  await knex.schema.dropTable("payments");
  await knex.schema.dropTable("payment_checkouts");
  await knex.schema.dropTable("deposit_requests");
  await knex.schema.dropTable("invoice_lines");
  await knex.schema.dropTable("invoices");
  await knex.schema.alterTable("shops", (t) => {
    t.dropColumn("next_invoice_number");
  });
}
