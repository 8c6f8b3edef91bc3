import type { Knex } from "knex";

// Sessions that can be ended. The session cookie stays a signed, encrypted JWT, but it carries
// the id of a row here, and every request checks the row: signing out, "sign out everywhere",
// a password change or losing a role ends rows, and the cookie stops working on its next use.
//
// Priority mail: a sign-in link goes through the outbox like every other e-mail (so one asked
// for while mail is down is sent when it is back), ahead of digests and alerts, and not at all
// once it could no longer be used (send_before).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("user_sessions", (t) => {
    // 128 random bits, hex; only ever inside the encrypted cookie and here.
    t.specificType("id", "char(32)").primary();
    t.integer("user_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.enum("method", ["password", "link"]).notNullable();
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    // Absolute end, whatever the cookie says: the JWT is re-issued while in use, the row is not.
    t.timestamp("expires_at", { precision: 3 }).notNullable();
    t.timestamp("ended_at", { precision: 3 }).nullable();
    t.string("ended_reason", 20).nullable();
    // "End every session of this user" and housekeeping of old rows.
    t.index(["user_id", "ended_at"]);
    t.index(["expires_at"]);
  });

  await knex.schema.alterTable("outbox", (t) => {
    // 0 for ordinary mail; higher goes first (sign-in links are 10).
    t.tinyint("priority").unsigned().notNullable().defaultTo(0);
    // Past this, the mail is useless (an expired sign-in link): dead-lettered instead of sent.
    t.timestamp("send_before", { precision: 3 }).nullable();
    // The worker's fast lane reads due priority mail by this index alone.
    t.index(["priority", "state", "next_attempt_at"], "outbox_priority_due");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("outbox", (t) => {
    t.dropIndex(["priority", "state", "next_attempt_at"], "outbox_priority_due");
    t.dropColumn("send_before");
    t.dropColumn("priority");
  });
  await knex.schema.dropTable("user_sessions");
}
