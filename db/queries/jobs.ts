import "server-only";
import crypto from "node:crypto";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { CustomersTable, JobStatusChangesTable, JobsTable, MachinesTable, Nullable, ShopsTable, UsersTable } from "@/db/tables";
import type { JobStatus } from "@/lib/job-status";
import type { MachineKind } from "@/lib/machine";
import { shopToday } from "@/lib/jobs-view";
import type { JobListQuery } from "@/lib/schemas/jobs";
import { searchPlan, smallSearch } from "./job-search";
import { ANSWERED_NOT_STARTED, type BoardExtras, boardJobs, boardOrder, INVOICE_STATE, OWNER_WAIT_DAYS, SINCE } from "./job-board";

export type JobRow = {
  id: number;
  shopId: number;
  number: number;
  publicId: string;
  status: JobStatus;
  concern: string;
  intakeNotes: string | null;
  promisedOn: string | null;
  createdAt: Date;
  updatedAt: Date;
  customerId: number;
  customerName: string;
  customerUserId: number | null;
  machineId: number;
  machine: { kind: MachineKind; year: number | null; make: string; model: string; serial: string | null };
  technician: { id: number; name: string } | null;
};

/** A row of JOB_COLUMNS: the job with its customer, machine and technician (left-joined). */
type JobJoin = Pick<JobsTable, "id" | "shop_id" | "number" | "public_id" | "status" | "concern" | "intake_notes" | "promised_on" | "created_at" | "updated_at" | "customer_id" | "machine_id" | "technician_user_id"> & {
  customer_name: CustomersTable["name"];
  customer_user_id: CustomersTable["user_id"];
  machine_kind: MachinesTable["kind"];
  machine_year: MachinesTable["year"];
  machine_make: MachinesTable["make"];
  machine_model: MachinesTable["model"];
  machine_serial: MachinesTable["serial"];
  technician_name: Nullable<UsersTable>["name"];
};
type ShopNames = { shop_name: ShopsTable["name"]; shop_slug: ShopsTable["slug"] };

const JOB_COLUMNS = [
  "j.id",
  "j.shop_id",
  "j.number",
  "j.public_id",
  "j.status",
  "j.concern",
  "j.intake_notes",
  "j.promised_on",
  "j.created_at",
  "j.updated_at",
  "j.customer_id",
  "c.name as customer_name",
  "c.user_id as customer_user_id",
  "j.machine_id",
  "m.kind as machine_kind",
  "m.year as machine_year",
  "m.make as machine_make",
  "m.model as machine_model",
  "m.serial as machine_serial",
  "j.technician_user_id",
  "t.name as technician_name",
];

function toJob(r: JobJoin): JobRow {
  return {
    id: Number(r.id),
    shopId: Number(r.shop_id),
    number: Number(r.number),
    publicId: String(r.public_id),
    status: r.status,
    concern: String(r.concern),
    intakeNotes: r.intake_notes ?? null,
    promisedOn: r.promised_on ?? null,
    createdAt: r.created_at,
    updatedAt: r.updated_at,
    customerId: Number(r.customer_id),
    customerName: String(r.customer_name),
    customerUserId: r.customer_user_id == null ? null : Number(r.customer_user_id),
    machineId: Number(r.machine_id),
    machine: {
      kind: r.machine_kind,
      year: r.machine_year == null ? null : Number(r.machine_year),
      make: String(r.machine_make),
      model: String(r.machine_model),
      serial: r.machine_serial ?? null,
    },
    technician: r.technician_user_id == null ? null : { id: Number(r.technician_user_id), name: String(r.technician_name) },
  };
}

function jobsWithDetails(k: Knex) {
  return k("jobs as j")
    .join("customers as c", "c.id", "j.customer_id")
    .join("machines as m", "m.id", "j.machine_id")
    .leftJoin("users as t", "t.id", "j.technician_user_id");
}

export type { BoardExtras } from "./job-board";

/**
 * The board's two queries (count, page), exported for the EXPLAIN test (tests/integration/board-explain.test.ts).
 * A search with words first asks whether its number and prefix branches find anything (`small`; job-search.ts).
 */
export async function boardQueries({ shopId, query, today = shopToday("UTC") }: { shopId: number; query: JobListQuery; today?: string }) {
  const k = db();
  const small = query.q && searchPlan(query.q).words ? smallSearch(k, shopId, query.q) : null;
  const anySmall = small ? Boolean(Number(((await small.first()) as { found: number | string } | undefined)?.found)) : false;
  // With no filter but statuses (and a technician), the per-status counts the jobs triggers keep
  // (migrations 29 and 40): a few rows, however long the shop's history; anything else counts the
  // jobs that match.
  const byCounters = !query.q && !query.attention.length;
  const count = byCounters
    ? k(query.technician ? "job_technician_counts" : "job_status_counts")
        .where("shop_id", shopId)
        .modify((q) => (query.technician ? q.where("technician_user_id", query.technician) : q))
        .modify((q) => (query.status.length ? q.whereIn("status", query.status) : q))
        .sum({ n: "n" })
    : boardJobs(k, shopId, query, today, anySmall).count({ n: "*" });
  const order = boardOrder(query.sort, query.dir);
  // A search reads all its hits to sort them anyway: the page counts them as it goes (a window
  // over the hits before LIMIT), instead of a second pass through the search (`count`, then only
  // for a page past the end).
  const countsItself = !!query.q;
  // The page's ids first, from jobs' indexes alone; the joins and the extras for those rows only.
  const ids = boardJobs(k, shopId, query, today, anySmall)
    .select("j.id")
    .modify((q) => (countsItself ? q.select(k.raw("COUNT(*) OVER () AS total")) : q))
    .orderBy(order)
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize);
  const page = k
    .from(ids.as("p"))
    .join("jobs as j", "j.id", "p.id")
    .join("customers as c", "c.id", "j.customer_id")
    .join("machines as m", "m.id", "j.machine_id")
    .leftJoin("users as t", "t.id", "j.technician_user_id")
    .select(JOB_COLUMNS)
    .modify((q) => (countsItself ? q.select("p.total") : q))
    .select(
      k.raw(`${SINCE} AS since`),
      k.raw(`${INVOICE_STATE} AS invoice_state`),
      k.raw(`${OWNER_WAIT_DAYS} AS owner_wait_days`),
      k.raw(`(${ANSWERED_NOT_STARTED}) AS answered_not_started`),
    )
    .orderBy(order);
  return { count, page, countsItself, small };
}

/**
 * One page of a shop's jobs. Every query here is scoped by shop_id first. `today` is the
 * shop's calendar date (YYYY-MM-DD, see shopToday) that decides what is overdue; UTC if left out.
 */
export async function listJobs({ shopId, query, today = shopToday("UTC") }: { shopId: number; query: JobListQuery; today?: string }) {
  const { count, page, countsItself } = await boardQueries({ shopId, query, today });
  const counted = async () => Number((await count.first())?.n ?? 0);
  const total = countsItself ? null : await counted();
  const rows: (JobJoin & { since: Date; invoice_state: BoardExtras["invoiceState"] | null; owner_wait_days: number; answered_not_started: number; total?: number })[] = await page;
  const found = total ?? (rows.length ? Number(rows[0]!.total) : query.page > 1 ? await counted() : 0);
  return {
    rows: rows.map((r) => ({
      ...toJob(r),
      since: new Date(r.since),
      invoiceState: r.invoice_state ?? "none",
      ownerWaitDays: Number(r.owner_wait_days),
      answeredNotStarted: Boolean(Number(r.answered_not_started)),
    })),
    total: found,
    page: query.page,
    pageSize: query.pageSize,
    pageCount: Math.max(1, Math.ceil(found / query.pageSize)),
  };
}

export async function getJobByNumber({ shopId, number }: { shopId: number; number: number }): Promise<JobRow | null> {
  const row: JobJoin | undefined = await jobsWithDetails(db()).where({ "j.shop_id": shopId, "j.number": number }).first(JOB_COLUMNS);
  return row ? toJob(row) : null;
}

type JobWithShop = JobRow & { shopName: string; shopSlug: string };

async function jobWithShop(where: { "j.public_id": string } | { "j.id": number }): Promise<JobWithShop | null> {
  const row: (JobJoin & ShopNames) | undefined = await jobsWithDetails(db())
    .join("shops as s", "s.id", "j.shop_id")
    .where(where)
    .first([...JOB_COLUMNS, "s.name as shop_name", "s.slug as shop_slug"]);
  return row ? { ...toJob(row), shopName: String(row.shop_name), shopSlug: String(row.shop_slug) } : null;
}

export async function getJobByPublicId({ publicId }: { publicId: string }): Promise<JobWithShop | null> {
  return jobWithShop({ "j.public_id": publicId });
}

/** The same, by row id (an invoice's or a deposit's job). */
export async function getJobById({ id }: { id: number }): Promise<JobWithShop | null> {
  return jobWithShop({ "j.id": id });
}

/** A job's public id from its row id (what an invoice, a deposit or a payment points at). */
export async function getJobPublicId({ id }: { id: number }): Promise<string | null> {
  const row = await db()("jobs").where({ id }).first("public_id");
  return row ? String(row.public_id) : null;
}

/**
 * The job row locked together with its customer and shop rows, for sending an approval request:
 * the status to move from, whom to mail, and the shop's name and currency.
 */
export async function lockJobForRequest(tx: Knex.Transaction, { shopId, jobId }: { shopId: number; jobId: number }) {
  type Row = Pick<JobsTable, "status"> & Pick<ShopsTable, "currency"> & { customer_name: string; customer_email: string | null; shop_name: string };
  const row: Row | undefined = await tx("jobs as j")
    .join("customers as c", "c.id", "j.customer_id")
    .join("shops as s", "s.id", "j.shop_id")
    .where({ "j.id": jobId, "j.shop_id": shopId })
    .forUpdate()
    .first("j.status", "c.name as customer_name", "c.email as customer_email", "s.name as shop_name", "s.currency");
  if (!row) return null;
  return { status: row.status, customerName: String(row.customer_name), customerEmail: row.customer_email ?? null, shopName: String(row.shop_name), currency: String(row.currency) };
}

/** Every job, in any shop, whose customer record is linked to this signed-in person. */
export async function listJobsForCustomerUser({ userId }: { userId: number }) {
  const rows: (JobJoin & Pick<ShopNames, "shop_name">)[] = await jobsWithDetails(db())
    .join("shops as s", "s.id", "j.shop_id")
    .where("c.user_id", userId)
    .orderByRaw("j.status = 'picked_up'")
    .orderBy("j.updated_at", "desc")
    .limit(200)
    .select([...JOB_COLUMNS, "s.name as shop_name"]);
  return rows.map((r) => ({ ...toJob(r), shopName: String(r.shop_name) }));
}

export async function listStatusChanges({ shopId, jobId }: { shopId: number; jobId: number }) {
  const rows: (Pick<JobStatusChangesTable, "id" | "from_status" | "to_status" | "note" | "changed_at"> & { by_name: string | null })[] = await db()("job_status_changes as h")
    .leftJoin("users as u", "u.id", "h.changed_by_user_id")
    .where({ "h.shop_id": shopId, "h.job_id": jobId })
    .orderBy("h.changed_at", "asc")
    .orderBy("h.id", "asc")
    .select("h.id", "h.from_status", "h.to_status", "h.note", "h.changed_at", "u.name as by_name");
  return rows.map((r) => ({
    id: Number(r.id),
    from: r.from_status ?? null,
    to: r.to_status,
    note: r.note ?? null,
    at: r.changed_at,
    by: r.by_name ?? null,
  }));
}

/** Hands out the shop's next job number inside the caller's transaction (row lock on the shop). */
export async function allocateJobNumber(tx: Knex.Transaction, shopId: number): Promise<number> {
  const shop = await tx("shops").where({ id: shopId }).forUpdate().first("next_job_number");
  if (!shop) throw new Error(`shop ${shopId} not found`);
  const number = Number(shop.next_job_number);
  await tx("shops").where({ id: shopId }).update({ next_job_number: number + 1 });
  return number;
}

export function newPublicId(): string {
  return crypto.randomBytes(12).toString("base64url");
}
