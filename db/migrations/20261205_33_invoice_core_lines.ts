import type { Knex } from "knex";

// Issue 19, cores on the invoice: a fitted part's core charge is a line of its own, and once the
// old core went back a credit line of the same amount takes it off again (lib/invoices.ts prices a
// credit as a negative amount, with its tax). Both point at their part (part_id), so bringing
// lines in again never adds one twice (unique per invoice, kind of line and part).
const SOURCES = ["authorised", "added"];
const WITH_CORES = [...SOURCES, "core_charge", "core_credit"];
const sourceEnum = (values: string[]) => `ENUM(${values.map((v) => `'${v}'`).join(", ")}) NOT NULL`;

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`ALTER TABLE invoice_lines MODIFY source ${sourceEnum(WITH_CORES)}`);
  await knex.schema.alterTable("invoice_lines", (t) => {
    t.bigInteger("part_id").unsigned().nullable();
    t.unique(["invoice_id", "source", "part_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex("invoice_lines").whereIn("source", ["core_charge", "core_credit"]).delete();
  await knex.schema.alterTable("invoice_lines", (t) => {
    t.dropUnique(["invoice_id", "source", "part_id"]);
    t.dropColumn("part_id");
  });
  await knex.raw(`ALTER TABLE invoice_lines MODIFY source ${sourceEnum(SOURCES)}`);
}
