import type { Knex } from "knex";

// Issue 20 §2: a phone's outbox replays a post after a dropped connection, a closed tab or a
// slept phone; the client-made key it carries makes the replay create nothing new. One row per
// (user, key), written in the transaction of the change it records, so a crash never leaves a
// change without its key or a key without its change. Rows lapse at expires_at and are purged.

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`CREATE TABLE idempotency_keys (
    user_id INT UNSIGNED NOT NULL,
    idem_key VARCHAR(100) CHARACTER SET ascii COLLATE ascii_bin NOT NULL,
    request_hash CHAR(64) CHARACTER SET ascii NOT NULL,
    response_status SMALLINT UNSIGNED NOT NULL,
    response_body LONGTEXT NOT NULL,
    created_at TIMESTAMP NOT NULL DEFAULT CURRENT_TIMESTAMP,
    expires_at TIMESTAMP NOT NULL,
    PRIMARY KEY (user_id, idem_key),
    KEY idempotency_keys_expires_index (expires_at),
    CONSTRAINT idempotency_keys_user_foreign FOREIGN KEY (user_id) REFERENCES users (id) ON DELETE CASCADE
  ) ENGINE=InnoDB`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("idempotency_keys");
}
