// "A refused request wrote nothing", measured: MariaDB's CHECKSUM TABLE over every table of the
// database under test, before and after. Background work of the running app (the mail worker,
// video webhooks) must have settled first: waitForQuiet.
import mysql from "mysql2/promise";

export type Checksums = Map<string, string>;

export async function connect(): Promise<mysql.Connection> {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error("DATABASE_URL is not set; run the end-to-end tests through `npm test`.");
  return mysql.createConnection(url);
}

export async function checksums(db: mysql.Connection): Promise<Checksums> {
  const [tables] = await db.query<mysql.RowDataPacket[]>("SHOW FULL TABLES WHERE Table_type = 'BASE TABLE'");
  const names = tables.map((row) => String(Object.values(row)[0]));
  const [rows] = await db.query<mysql.RowDataPacket[]>(`CHECKSUM TABLE ${names.map((n) => `\`${n}\``).join(", ")}`);
  // NULL is what CHECKSUM TABLE answers for a table it couldn't read: that would compare equal forever.
  const unread = rows.filter((r) => r.Checksum === null).map((r) => String(r.Table));
  if (unread.length) throw new Error(`CHECKSUM TABLE gave no checksum for ${unread.join(", ")}`);
  return new Map(rows.map((r) => [String(r.Table).split(".").pop()!, String(r.Checksum)]));
}

/** Tables whose checksum differs (or that appeared or vanished). */
export function changedTables(before: Checksums, after: Checksums): string[] {
  const names = new Set([...before.keys(), ...after.keys()]);
  return [...names].filter((n) => before.get(n) !== after.get(n)).sort();
}

/**
 * Holds the mail worker still (SIGSTOP to its process group; `npm test` names it in
 * E2E_MAIL_WORKER_PGID) for a before/after comparison that spans minutes. The worker writes on
 * clocks of its own, which no quiet wait can rule out: a follower's progress mail once the shop's
 * window has passed since an entry was shared, approval reminders, retries of a refused mail.
 * A transaction of its own caught open stays uncommitted until the returned resume, so it can't
 * land between the two readings either. Outside `npm test` there is no worker to hold.
 */
export function holdMailWorker(): () => void {
  const group = Number(process.env.E2E_MAIL_WORKER_PGID);
  if (!Number.isInteger(group) || group <= 0) return () => undefined;
  process.kill(-group, "SIGSTOP");
  let held = true;
  return () => {
    if (held) process.kill(-group, "SIGCONT");
    held = false;
  };
}

/** Waits until two readings a second apart agree, so what changes next is the test's doing. */
export async function waitForQuiet(db: mysql.Connection, timeoutMs = 60_000): Promise<Checksums> {
  const until = Date.now() + timeoutMs;
  let last = await checksums(db);
  let busy: string[] = [];
  while (Date.now() < until) {
    await new Promise((r) => setTimeout(r, 1_000));
    const now = await checksums(db);
    busy = changedTables(last, now);
    if (busy.length === 0) return now;
    last = now;
  }
  throw new Error(`The database kept changing for ${timeoutMs / 1000} s (${busy.join(", ")}): something in the background is still writing.`);
}

/**
 * For a failure message: the rows of `tables` that something wrote since `since`, as far as their
 * own time columns tell (any DATETIME/TIMESTAMP column at or after it), a few per table, so a
 * background writer shows itself by name.
 */
export async function recentRows(db: mysql.Connection, tables: string[], since: Date, perTable = 3): Promise<string[]> {
  const lines: string[] = [];
  for (const table of tables) {
    const [cols] = await db.query<mysql.RowDataPacket[]>(
      "SELECT COLUMN_NAME AS name FROM information_schema.COLUMNS WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = ? AND DATA_TYPE IN ('datetime', 'timestamp')",
      [table],
    );
    const names = cols.map((c) => String(c.name));
    if (!names.length) {
      lines.push(`${table}: no time column to tell which rows changed`);
      continue;
    }
    const [rows] = await db.query<mysql.RowDataPacket[]>(
      `SELECT * FROM \`${table}\` WHERE ${names.map((n) => `\`${n}\` >= ?`).join(" OR ")} LIMIT ${perTable}`,
      names.map(() => since),
    );
    lines.push(`${table}: ${rows.length ? rows.map((r) => JSON.stringify(r).slice(0, 400)).join("\n    ") : "no row with a time after the start"}`);
  }
  return lines;
}
