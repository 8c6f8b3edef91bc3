import type { Knex } from "knex";

// The job's timeline. One row per entry whatever its kind (note, photo set, status change,
// and later clips, readings, torque records…); kind-specific data sits in `body` (JSON) or
// in child tables such as `photos`. Rows are never removed by staff: deleting sets deleted_at,
// and every edit, share or delete first copies the previous state into entry_revisions.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("journal_entries", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.integer("job_id").unsigned().notNullable();
    t.string("kind", 24).notNullable();
    t.enum("visibility", ["shop", "shared"]).notNullable().defaultTo("shop");
    t.integer("author_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.json("body").nullable();
    t.string("caption", 500).nullable();
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("edited_at", { precision: 3 }).nullable();
    t.timestamp("shared_at", { precision: 3 }).nullable();
    t.timestamp("deleted_at", { precision: 3 }).nullable();
    t.unique(["shop_id", "id"]);
    t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
    // Timeline pages walk (job, id) in either direction; ids follow posting order.
    t.index(["job_id", "id"]);
    t.index(["job_id", "visibility", "id"]);
  });

  await knex.schema.createTable("journal_entry_revisions", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.bigInteger("entry_id").unsigned().notNullable();
    t.integer("version").unsigned().notNullable();
    t.enum("change", ["edit", "share", "unshare", "delete"]).notNullable();
    t.enum("visibility", ["shop", "shared"]).notNullable();
    t.json("body").nullable();
    t.string("caption", 500).nullable();
    t.integer("changed_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("changed_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.foreign(["shop_id", "entry_id"]).references(["shop_id", "id"]).inTable("journal_entries").onDelete("CASCADE");
    t.index(["entry_id", "version"]);
  });

  // A photo is uploaded first (entry_id null, visible to the shop only) and joins an entry when
  // the set is posted, so a set is created in one step with exactly the photos that arrived.
  await knex.schema.createTable("photos", (t) => {
    t.bigIncrements("id").unsigned().primary();
    // Opaque id for URLs: photo addresses can't be walked by counting.
    t.specificType("public_id", "char(22)").notNullable().unique();
    t.integer("shop_id").unsigned().notNullable();
    t.integer("job_id").unsigned().notNullable();
    t.bigInteger("entry_id").unsigned().nullable();
    t.smallint("position").unsigned().notNullable().defaultTo(0);
    t.integer("uploaded_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.string("original_name", 255).nullable();
    t.string("display_key", 255).notNullable();
    t.string("thumb_key", 255).notNullable();
    t.integer("width").unsigned().notNullable();
    t.integer("height").unsigned().notNullable();
    t.integer("bytes").unsigned().notNullable();
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
    t.foreign(["shop_id", "entry_id"]).references(["shop_id", "id"]).inTable("journal_entries").onDelete("CASCADE");
    t.index(["entry_id", "position"]);
    t.index(["job_id", "entry_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("photos");
  await knex.schema.dropTable("journal_entry_revisions");
  await knex.schema.dropTable("journal_entries");
}
