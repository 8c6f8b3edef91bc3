import type { Knex } from "knex";

// The authorisation the machine's owner signs when leaving it: a diagnosis / inspection charge and
// an "authorised up to" amount, with the wording shown (REFERENCES §6: a written estimate and
// consent before work). Its own table rather than an approval request: a request belongs to a
// finding, is answered line by line and moves the job to "waiting on the owner"; this is one
// agreement per job, signed once. While unsigned the desk may redo it (a new snapshot and hash);
// signing fills the signature columns once, and only for the hash that was shown.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("dropoff_authorisations", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.specificType("public_id", "char(16)").notNullable().unique();
    t.integer("shop_id").unsigned().notNullable();
    t.integer("job_id").unsigned().notNullable();
    t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
    // What the owner is shown, the exact text hashed, and its SHA-256.
    t.json("snapshot").notNullable();
    t.text("canonical", "longtext").notNullable();
    t.specificType("hash", "char(64)").notNullable();
    t.specificType("currency", "char(3)").notNullable();
    // Pre-tax, minor units; the limit includes the diagnosis charge.
    t.integer("diagnosis_minor").unsigned().notNullable();
    t.integer("authorised_up_to_minor").unsigned().notNullable();
    t.integer("created_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("updated_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    // The e-mailed link (null: not sent).
    t.string("sent_to", 254).nullable();
    t.timestamp("sent_at", { precision: 3 }).nullable();
    // The signature: all null until signed.
    t.enum("method", ["online", "in_person"]).nullable();
    t.string("signature_name", 120).nullable();
    t.boolean("wants_parts_back").notNullable().defaultTo(false);
    t.timestamp("signed_at", { precision: 3 }).nullable();
    t.specificType("shown_hash", "char(64)").nullable();
    t.string("ip", 45).nullable();
    t.string("user_agent", 500).nullable();
    t.integer("recorded_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.unique(["shop_id", "id"]);
    // One per job.
    t.unique(["shop_id", "job_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("dropoff_authorisations");
}
