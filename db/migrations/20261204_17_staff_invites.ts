import type { Knex } from "knex";
import { STAFF_ROLES } from "../../lib/permissions";

// Staff accounts run from the product (issue 16 §3): the owner invites by e-mail, and anyone
// with a password can have a reset link mailed. Both kinds of link keep only a hash of their
// token, expire, and work once (used_at). New attempt kinds keep their limits in auth_attempts.
const OLD_KINDS = ["password", "link_request", "link_use"];
const NEW_KINDS = [...OLD_KINDS, "reset_request", "token_use", "password_change"];

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("staff_invites", (t) => {
    t.increments("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable().references("shops.id").onDelete("CASCADE");
    t.string("email", 254).notNullable();
    t.string("name", 120).notNullable();
    t.enum("role", [...STAFF_ROLES]).notNullable();
    t.specificType("token_hash", "char(64)").notNullable().unique();
    t.integer("invited_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("expires_at", { precision: 3 }).notNullable();
    t.timestamp("used_at", { precision: 3 }).nullable();
    // Withdrawn by the owner before it was used.
    t.timestamp("revoked_at", { precision: 3 }).nullable();
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    // The staff page lists a shop's open invites, newest first.
    t.index(["shop_id", "created_at"]);
  });

  await knex.schema.createTable("password_resets", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("user_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.specificType("token_hash", "char(64)").notNullable().unique();
    t.timestamp("expires_at", { precision: 3 }).notNullable();
    t.timestamp("used_at", { precision: 3 }).nullable();
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["user_id", "created_at"]);
  });

  await knex.raw(`ALTER TABLE auth_attempts MODIFY kind ENUM(${NEW_KINDS.map(() => "?").join(", ")}) NOT NULL`, NEW_KINDS);
}

export async function down(knex: Knex): Promise<void> {
  await knex("auth_attempts").whereNotIn("kind", OLD_KINDS).delete();
  await knex.raw(`ALTER TABLE auth_attempts MODIFY kind ENUM(${OLD_KINDS.map(() => "?").join(", ")}) NOT NULL`, OLD_KINDS);
  await knex.schema.dropTable("password_resets");
  await knex.schema.dropTable("staff_invites");
}
