import type { Knex } from "knex";

// Page versions: a counter per job, per shop and one for the whole instance, moved by triggers on
// every table a page can show, whoever writes (the app, a worker, a webhook, a seed, an SQL
// fixture). A signed-in job page rendered once is served again from lib/server/page-cache.ts only
// while the counters it was rendered under are unchanged, so no writer has to remember to drop it.
//
// Which counter a table moves is read from the schema itself (information_schema), by these rules:
// - `jobs`, and a table with a `job_id` column: that job's counter;
// - a table with a foreign key to one of those (an approval's lines, an invoice's lines…): the
//   counter of the job its parent row belongs to;
// - `shops`, a table with a `shop_id` column, or a foreign key to a table with one: that shop's counter;
// - any other table: the instance's counter (people's names, say).
// A row that names no job or shop (a NULL job_id) moves nothing. An update of `users` moves the
// counter only when what pages show of a person changes (PAGE_VERSION_COLUMNS), not at each sign-in.
// Tables no page shows, or that are checked on every request anyway, are left out: PAGE_VERSION_SKIP.
// The counters are rows updated in the writer's transaction, so writers to one job (or to one
// shop's own records) wait for each other's commit; nothing shop-wide is counted per event, so
// writers on different jobs never do. (The staff pages' unread count is part of the cache key instead.)
// A migration that adds a table calls addPageVersionTriggers(knex, table) for it (one that gives a
// table its job or shop column later drops and adds them again); tests/integration/page-versions.test.ts
// fails for a table whose triggers are missing or out of date and that has no place in the list.

export const PAGE_VERSION_SKIP: Record<string, string> = {
  knex_migrations: "migration bookkeeping",
  knex_migrations_lock: "migration bookkeeping",
  page_versions: "the counters themselves",
  job_status_counts: "kept from jobs by triggers (jobs moves the counters)",
  job_technician_counts: "kept from jobs by triggers (jobs moves the counters)",
  user_sessions: "checked on every request (lib/server/actor.ts), and part of the cache key",
  sign_in_links: "sign-in state, never shown on a page",
  auth_attempts: "sign-in throttling, never shown on a page",
  password_resets: "sign-in state, never shown on a page",
  idempotency_keys: "stored answers for replayed posts, never shown on a page",
  webhook_events: "the raw delivery log; what a delivery changes is written to the tables it changes",
  inbox_reads: "a person's read marks: the unread count they feed is read into the staff pages' cache key",
  payment_webhook_events: "deliveries already handled (deduplication); their effects are written elsewhere",
  video_webhook_events: "deliveries already handled (deduplication); their effects are written elsewhere",
  mail_webhook_events: "deliveries already handled (deduplication); their effects are written elsewhere",
  text_status_events: "statuses already applied (deduplication); the text's state is kept on text_outbox",
};

export type PageVersionScope = "job" | "shop" | "all";

/** Tables whose updates move the counter only when one of these columns changes. */
export const PAGE_VERSION_COLUMNS: Record<string, string[]> = {
  users: ["name", "email"],
};

type Column = { table: string; column: string };
/** A foreign key: its columns and the parent's, in order. */
type ForeignKey = { table: string; name: string; columns: string[]; parent: string; parentColumns: string[] };
/** The row's own column, or the column `target` of its parent row found through a foreign key. */
type Via = { column: string } | { key: ForeignKey; target: string };

export type TableRule = { table: string; scope: "job" | "shop"; via: Via } | { table: string; scope: "all" };

/** The rule of each base table of the current database (skipped ones left out). */
export async function pageVersionRules(knex: Knex): Promise<TableRule[]> {
  const [tables] = (await knex.raw("SELECT TABLE_NAME AS t FROM information_schema.TABLES WHERE TABLE_SCHEMA = DATABASE() AND TABLE_TYPE = 'BASE TABLE' ORDER BY TABLE_NAME")) as [{ t: string }[]];
  const [columns] = (await knex.raw("SELECT TABLE_NAME AS `table`, COLUMN_NAME AS `column` FROM information_schema.COLUMNS WHERE TABLE_SCHEMA = DATABASE()")) as [Column[]];
  const [keyColumns] = (await knex.raw(
    `SELECT TABLE_NAME AS \`table\`, CONSTRAINT_NAME AS name, COLUMN_NAME AS \`column\`, REFERENCED_TABLE_NAME AS parent, REFERENCED_COLUMN_NAME AS parentColumn
     FROM information_schema.KEY_COLUMN_USAGE
     WHERE TABLE_SCHEMA = DATABASE() AND REFERENCED_TABLE_NAME IS NOT NULL
     ORDER BY TABLE_NAME, CONSTRAINT_NAME, ORDINAL_POSITION`,
  )) as [{ table: string; name: string; column: string; parent: string; parentColumn: string }[]];
  const keys: ForeignKey[] = [];
  for (const c of keyColumns) {
    const key = keys.find((k) => k.table === c.table && k.name === c.name);
    if (key) {
      key.columns.push(c.column);
      key.parentColumns.push(c.parentColumn);
    } else keys.push({ table: c.table, name: c.name, columns: [c.column], parent: c.parent, parentColumns: [c.parentColumn] });
  }
  const has = (table: string, column: string) => columns.some((c) => c.table === table && c.column === column);
  const jobOf = (table: string) => (table === "jobs" ? "id" : has(table, "job_id") ? "job_id" : null);
  const rules: TableRule[] = [];
  for (const { t: table } of tables) {
    if (table in PAGE_VERSION_SKIP) continue;
    const own = jobOf(table);
    if (own) {
      rules.push({ table, scope: "job", via: { column: own } });
      continue;
    }
    const toJob = keys.find((k) => k.table === table && jobOf(k.parent));
    if (toJob) {
      rules.push({ table, scope: "job", via: { key: toJob, target: jobOf(toJob.parent)! } });
      continue;
    }
    if (table === "shops" || has(table, "shop_id")) {
      rules.push({ table, scope: "shop", via: { column: table === "shops" ? "id" : "shop_id" } });
      continue;
    }
    const toShop = keys.find((k) => k.table === table && (k.parent === "shops" || has(k.parent, "shop_id")));
    if (toShop) {
      rules.push({ table, scope: "shop", via: { key: toShop, target: toShop.parent === "shops" ? "id" : "shop_id" } });
      continue;
    }
    rules.push({ table, scope: "all" });
  }
  return rules;
}

const bump = (scope: PageVersionScope, ref: string) => {
  const upsert = `INSERT INTO page_versions (scope, ref, version) VALUES ('${scope}', ${ref}, 1) ON DUPLICATE KEY UPDATE version = version + 1`;
  return scope === "all" ? upsert : `IF ${ref} IS NOT NULL THEN ${upsert}; END IF`;
};

/** The expression naming the job or shop a row (NEW or OLD) belongs to. */
function refOf(rule: TableRule, row: "NEW" | "OLD"): string {
  if (rule.scope === "all") return "0";
  const via = rule.via;
  if ("column" in via) return `${row}.\`${via.column}\``;
  const match = via.key.columns.map((c, i) => `p.\`${via.key.parentColumns[i]}\` = ${row}.\`${c}\``).join(" AND ");
  return `(SELECT p.\`${via.target}\` FROM \`${via.key.parent}\` p WHERE ${match} LIMIT 1)`;
}

const triggerName = (table: string, event: "i" | "u" | "d") => `pv_${table}_${event}`.slice(0, 64);

function statements(rule: TableRule, row: "NEW" | "OLD"): string[] {
  return [bump(rule.scope, refOf(rule, row))];
}

/** The update's statements, run only when a shown column changed for a table in PAGE_VERSION_COLUMNS. */
function shownChange(table: string, parts: string[]): string {
  const columns = PAGE_VERSION_COLUMNS[table];
  const all = parts.join("; ");
  if (!columns) return all;
  return `IF NOT (${columns.map((c) => `NEW.\`${c}\` <=> OLD.\`${c}\``).join(" AND ")}) THEN ${all}; END IF`;
}

/** The three triggers (insert, update, delete) that move the table's counter. */
export function pageVersionTriggerSql(rule: TableRule): string[] {
  const body = (parts: string[]) => `BEGIN ${parts.map((p) => `${p};`).join(" ")} END`;
  return [
    `CREATE TRIGGER ${triggerName(rule.table, "i")} AFTER INSERT ON \`${rule.table}\` FOR EACH ROW ${body(statements(rule, "NEW"))}`,
    // An update moves the row's counter, and the old one's too when the row moved to another job or shop.
    `CREATE TRIGGER ${triggerName(rule.table, "u")} AFTER UPDATE ON \`${rule.table}\` FOR EACH ROW ${body([shownChange(rule.table, [
      ...statements(rule, "NEW"),
      ...(rule.scope === "all" ? [] : [`IF NOT (${refOf(rule, "NEW")} <=> ${refOf(rule, "OLD")}) THEN ${statements(rule, "OLD").join("; ")}; END IF`]),
    ])])}`,
    `CREATE TRIGGER ${triggerName(rule.table, "d")} AFTER DELETE ON \`${rule.table}\` FOR EACH ROW ${body(statements(rule, "OLD"))}`,
  ];
}

export async function addPageVersionTriggers(knex: Knex, table: string): Promise<void> {
  const rule = (await pageVersionRules(knex)).find((r) => r.table === table);
  if (!rule) throw new Error(`${table}: no such table, or it is in PAGE_VERSION_SKIP`);
  for (const sql of pageVersionTriggerSql(rule)) await knex.raw(sql);
}

export async function dropPageVersionTriggers(knex: Knex, table: string): Promise<void> {
  for (const e of ["i", "u", "d"] as const) await knex.raw(`DROP TRIGGER IF EXISTS ${triggerName(table, e)}`);
}

/**
 * Tables of the current database that are neither skipped nor carry the three triggers their rule
 * gives today (for tests/integration/page-versions.test.ts): a table added without them, or one
 * whose job or shop column changed after its triggers were made, is listed.
 */
export async function tablesWithoutPageVersions(knex: Knex): Promise<string[]> {
  const rules = await pageVersionRules(knex);
  const [triggers] = (await knex.raw("SELECT TRIGGER_NAME AS name, ACTION_STATEMENT AS body FROM information_schema.TRIGGERS WHERE TRIGGER_SCHEMA = DATABASE()")) as [{ name: string; body: string }[]];
  const bodies = new Map(triggers.map((t) => [t.name, t.body.trim()]));
  return rules
    .filter((rule) => {
      const expected = pageVersionTriggerSql(rule).map((sql) => [/^CREATE TRIGGER (\S+)/.exec(sql)![1]!, sql.slice(sql.indexOf(" FOR EACH ROW ") + " FOR EACH ROW ".length)] as const);
      return !expected.every(([name, body]) => bodies.get(name) === body);
    })
    .map((rule) => rule.table);
}
