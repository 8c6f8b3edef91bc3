import type { Knex } from "knex";

// Approval requests for added work. A finding is the staff's editable draft (what was found, its
// evidence and proposed lines); sending it freezes a request: the snapshot shown to the owner, its
// canonical JSON and that text's SHA-256. A request is never edited: a revision is a new request
// and the old one is marked replaced. One decision per request, guaranteed by a unique key.
// Money is integer minor units; percents are DECIMAL read back as exact strings.
const SAFETY = ["none", "brakes", "steering", "fuel", "throttle"] as const;

/** (shop_id, job_id) → jobs, as every job child does, so rows can't cross shops. */
function jobChild(t: Knex.CreateTableBuilder) {
  t.integer("shop_id").unsigned().notNullable();
  t.integer("job_id").unsigned().notNullable();
  t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
}

export async function up(knex: Knex): Promise<void> {
  // A shop without a row gets the defaults here (strict tolerance, no tax, no supplies fee).
  await knex.schema.createTable("shop_money_settings", (t) => {
    t.integer("shop_id").unsigned().primary().references("shops.id").onDelete("CASCADE");
    // Per hour; null until the shop sets it (the desk then types a rate on each labour line).
    t.integer("labour_rate_minor").unsigned().nullable();
    t.decimal("tax_rate_percent", 9, 6).notNullable().defaultTo(0);
    t.enum("tax_method", ["per_line", "per_invoice"]).notNullable().defaultTo("per_invoice");
    t.boolean("parts_taxable").notNullable().defaultTo(true);
    t.boolean("labour_taxable").notNullable().defaultTo(false);
    t.boolean("fees_taxable").notNullable().defaultTo(false);
    // Null percent: no shop-supplies fee.
    t.decimal("supplies_percent", 9, 6).nullable();
    t.enum("supplies_base", ["labour", "parts_and_labour"]).notNullable().defaultTo("labour");
    t.integer("supplies_cap_minor").unsigned().nullable();
    t.boolean("supplies_taxable").notNullable().defaultTo(false);
    t.enum("tolerance_kind", ["strict", "greater_of"]).notNullable().defaultTo("strict");
    t.integer("tolerance_fixed_minor").unsigned().notNullable().defaultTo(0);
    t.decimal("tolerance_percent", 9, 6).notNullable().defaultTo(0);
    t.integer("tolerance_cap_minor").unsigned().nullable();
    t.smallint("reminder_delay_hours").unsigned().notNullable().defaultTo(24);
    t.timestamp("updated_at").notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable("findings", (t) => {
    t.bigIncrements("id").unsigned().primary();
    jobChild(t);
    t.string("title", 200).notNullable();
    t.text("found").notNullable();
    t.text("why_it_matters").nullable();
    t.enum("safety", [...SAFETY]).notNullable().defaultTo("none");
    // Bumped on every save, so two people editing one draft can't overwrite each other unseen.
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.integer("created_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("updated_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.unique(["shop_id", "id"]);
    t.index(["shop_id", "job_id", "id"]);
  });

  // Evidence points at a photo (public id), a reading (id) or a clip (public id, with a moment);
  // no foreign key, since it may name any of three tables; the server checks it on save.
  await knex.schema.createTable("finding_evidence", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.bigInteger("finding_id").unsigned().notNullable();
    t.smallint("position").unsigned().notNullable();
    t.enum("kind", ["photo", "reading", "clip"]).notNullable();
    t.string("ref", 64).notNullable();
    t.integer("moment_ms").unsigned().nullable();
    t.foreign(["shop_id", "finding_id"]).references(["shop_id", "id"]).inTable("findings").onDelete("CASCADE");
    t.unique(["finding_id", "kind", "ref", "moment_ms"]);
  });

  await knex.schema.createTable("finding_lines", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.bigInteger("finding_id").unsigned().notNullable();
    t.smallint("position").unsigned().notNullable();
    t.enum("kind", ["part", "labour", "fee"]).notNullable();
    t.string("description", 200).notNullable();
    t.string("part_number", 60).nullable();
    // Thousandths and tenths, as lib/money.ts counts them (1500 = 1.5 L; 15 = 1.5 h).
    t.integer("qty_thousandths").unsigned().nullable();
    t.integer("unit_price_minor").unsigned().nullable();
    t.integer("hours_tenths").unsigned().nullable();
    t.integer("rate_minor").unsigned().nullable();
    t.integer("amount_minor").unsigned().nullable();
    t.boolean("taxable").notNullable();
    t.foreign(["shop_id", "finding_id"]).references(["shop_id", "id"]).inTable("findings").onDelete("CASCADE");
    t.index(["finding_id", "position"]);
  });

  await knex.schema.createTable("approval_requests", (t) => {
    t.bigIncrements("id").unsigned().primary();
    // Opaque id for the owner's links (ids in order would be guessable).
    t.specificType("public_id", "char(16)").notNullable().unique();
    jobChild(t);
    t.bigInteger("finding_id").unsigned().notNullable();
    t.integer("version").unsigned().notNullable();
    t.enum("status", ["sent", "answered", "withdrawn", "replaced"]).notNullable().defaultTo("sent");
    t.bigInteger("replaced_by_id").unsigned().nullable();
    t.json("snapshot").notNullable();
    // The exact text that was hashed, kept so the hash can be checked again at any time.
    t.text("canonical", "longtext").notNullable();
    t.specificType("hash", "char(64)").notNullable();
    // SHA-256 of the token in the e-mail's image links (the raw token is only ever in the mail).
    t.specificType("token_hash", "char(64)").notNullable().unique();
    t.specificType("currency", "char(3)").notNullable();
    t.integer("estimate_pre_tax_minor").notNullable();
    t.integer("estimate_tax_minor").notNullable();
    t.integer("estimate_total_minor").notNullable();
    t.string("sent_to", 254).nullable();
    t.integer("sent_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("sent_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("opened_at", { precision: 3 }).nullable();
    t.timestamp("answered_at", { precision: 3 }).nullable();
    t.timestamp("withdrawn_at", { precision: 3 }).nullable();
    t.integer("withdrawn_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.unique(["shop_id", "id"]);
    t.unique(["finding_id", "version"]);
    t.foreign(["shop_id", "finding_id"]).references(["shop_id", "id"]).inTable("findings").onDelete("CASCADE");
    t.foreign(["replaced_by_id"]).references(["id"]).inTable("approval_requests").onDelete("SET NULL");
    t.index(["shop_id", "job_id", "status"]);
  });

  await knex.schema.createTable("approval_decisions", (t) => {
    t.bigIncrements("id").unsigned().primary();
    jobChild(t);
    // The database's own guarantee that a request is answered once, whatever the UI does.
    t.bigInteger("request_id").unsigned().notNullable().unique();
    t.enum("method", ["online", "phone", "in_person"]).notNullable();
    // Who authorised: the name typed as a signature online; the person spoken to otherwise.
    t.string("person_name", 120).notNullable();
    t.string("signature_name", 120).nullable();
    t.string("phone_called", 40).nullable();
    t.string("note", 500).nullable();
    t.boolean("wants_parts_back").notNullable().defaultTo(false);
    t.timestamp("decided_at", { precision: 3 }).notNullable();
    t.timestamp("recorded_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.integer("recorded_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.string("ip", 45).nullable();
    t.string("user_agent", 500).nullable();
    t.specificType("shown_hash", "char(64)").notNullable();
    t.integer("estimate_pre_tax_minor").notNullable();
    t.integer("estimate_total_minor").notNullable();
    t.integer("authorised_pre_tax_minor").notNullable();
    t.integer("authorised_tax_minor").notNullable();
    t.integer("authorised_total_minor").notNullable();
    t.unique(["shop_id", "id"]);
    t.foreign(["shop_id", "request_id"]).references(["shop_id", "id"]).inTable("approval_requests").onDelete("CASCADE");
    t.index(["shop_id", "job_id"]);
  });

  // Each line as answered, copied from the snapshot so the record stands on its own.
  await knex.schema.createTable("approval_decision_lines", (t) => {
    t.bigIncrements("id").unsigned().primary();
    jobChild(t);
    t.bigInteger("decision_id").unsigned().notNullable();
    t.smallint("line_no").unsigned().notNullable();
    t.enum("answer", ["approved", "declined"]).notNullable();
    t.enum("kind", ["part", "labour", "fee"]).notNullable();
    t.string("description", 200).notNullable();
    t.string("part_number", 60).nullable();
    t.integer("qty_thousandths").unsigned().nullable();
    t.integer("hours_tenths").unsigned().nullable();
    t.integer("net_minor").notNullable();
    t.boolean("taxable").notNullable();
    t.unique(["decision_id", "line_no"]);
    t.foreign(["shop_id", "decision_id"]).references(["shop_id", "id"]).inTable("approval_decisions").onDelete("CASCADE");
    t.index(["shop_id", "job_id", "answer"]);
  });

  // The job's authorised work: every approved line of every answered request.
  await knex.raw(`
    CREATE VIEW job_authorised_work AS
    SELECT l.shop_id, l.job_id, r.id AS request_id, r.public_id AS request_public_id, d.id AS decision_id,
           l.line_no, l.kind, l.description, l.part_number, l.qty_thousandths, l.hours_tenths, l.net_minor, l.taxable,
           d.method, d.decided_at
    FROM approval_decision_lines l
    JOIN approval_decisions d ON d.id = l.decision_id
    JOIN approval_requests r ON r.id = d.request_id
    WHERE l.answer = 'approved'`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("DROP VIEW IF EXISTS job_authorised_work");
  await knex.schema.dropTable("approval_decision_lines");
  await knex.schema.dropTable("approval_decisions");
  await knex.schema.dropTable("approval_requests");
  await knex.schema.dropTable("finding_lines");
  await knex.schema.dropTable("finding_evidence");
  await knex.schema.dropTable("findings");
  await knex.schema.dropTable("shop_money_settings");
}
