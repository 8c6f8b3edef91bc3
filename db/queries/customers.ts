import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { CustomersTable, JobsTable, MachinesTable, UsersTable } from "@/db/tables";
import type { ContactPreference } from "@/lib/customers";
import { AppError } from "@/lib/errors";
import type { JobStatus } from "@/lib/job-status";
import type { MachineKind } from "@/lib/machine";
import { CUSTOMER_PAGE_SIZE, type ContactInput, type CustomerListQuery } from "@/lib/schemas/customers";

// The shop's customers: the list (search, server paging), one customer's page and editing their
// contact details. Merging two records is in ./customer-merge.ts.

export type CustomerRow = {
  id: number;
  shopId: number;
  userId: number | null;
  name: string;
  email: string | null;
  phone: string | null;
  contactPreference: ContactPreference | null;
  createdAt: Date;
};

export type MachineSummary = {
  id: number;
  kind: MachineKind;
  year: number | null;
  make: string;
  model: string;
  serial: string | null;
};

const toCustomer = (r: CustomersTable): CustomerRow => ({
  id: Number(r.id),
  shopId: Number(r.shop_id),
  userId: r.user_id == null ? null : Number(r.user_id),
  name: r.name,
  email: r.email ?? null,
  phone: r.phone ?? null,
  contactPreference: r.contact_preference ?? null,
  createdAt: r.created_at,
});

const toMachine = (m: Pick<MachinesTable, "id" | "kind" | "year" | "make" | "model" | "serial">): MachineSummary => ({
  id: Number(m.id),
  kind: m.kind,
  year: m.year == null ? null : Number(m.year),
  make: m.make,
  model: m.model,
  serial: m.serial ?? null,
});

/** A JSON column: text or already parsed, depending on how the server reports the column. */
const json = (v: unknown): unknown => (typeof v === "string" ? JSON.parse(v) : (v ?? null));

const escapeLike = (q: string) => `%${q.replace(/[\\%_]/g, (ch) => `\\${ch}`)}%`;

/** One of this shop's customers, or null (another shop's id finds nothing). */
export async function getCustomer({ shopId, customerId }: { shopId: number; customerId: number }, k: Knex = db()): Promise<CustomerRow | null> {
  const row = await k("customers").where({ shop_id: shopId, id: customerId }).first();
  return row ? toCustomer(row) : null;
}

/**
 * A page of the shop's customers matching a name, e-mail, phone (digits only) or one of their
 * machines' make, model or serial, by name. Three queries whatever the page size: the count,
 * the page (with job counts), and the page's machines.
 */
export async function listCustomers({ shopId, query, pageSize = CUSTOMER_PAGE_SIZE }: { shopId: number; query: CustomerListQuery; pageSize?: number }) {
  const base = db()("customers as c").where("c.shop_id", shopId);
  if (query.q) {
    const like = escapeLike(query.q);
    const digits = query.q.replace(/\D/g, "");
    base.where((w) => {
      w.orWhere("c.name", "like", like).orWhere("c.email", "like", like);
      if (digits.length >= 3) w.orWhereRaw("REGEXP_REPLACE(c.phone, '[^0-9]', '') LIKE ?", [`%${digits}%`]);
      w.orWhereExists((m) =>
        m
          .from("machines as m")
          .whereRaw("m.shop_id = c.shop_id AND m.customer_id = c.id")
          .where((mw) => mw.orWhere("m.make", "like", like).orWhere("m.model", "like", like).orWhere("m.serial", "like", like)),
      );
    });
  }
  const countRow = await base.clone().count({ n: "c.id" }).first();
  const total = Number(countRow?.n ?? 0);
  const rows: (CustomersTable & {
    job_count: number;
    open_job_count: number;
    last_job_at: Date | null;
  })[] = await base
    .clone()
    .select("c.*")
    .select(
      db().raw("(SELECT COUNT(*) FROM jobs j WHERE j.shop_id = c.shop_id AND j.customer_id = c.id) AS job_count"),
      db().raw("(SELECT COUNT(*) FROM jobs j WHERE j.shop_id = c.shop_id AND j.customer_id = c.id AND j.status <> 'picked_up') AS open_job_count"),
      db().raw("(SELECT MAX(j.created_at) FROM jobs j WHERE j.shop_id = c.shop_id AND j.customer_id = c.id) AS last_job_at"),
    )
    .orderBy("c.name")
    .orderBy("c.id")
    .limit(pageSize)
    .offset((query.page - 1) * pageSize);
  const ids = rows.map((r) => Number(r.id));
  const machines: Pick<MachinesTable, "id" | "customer_id" | "kind" | "year" | "make" | "model" | "serial">[] = ids.length
    ? await db()("machines").where("shop_id", shopId).whereIn("customer_id", ids).orderBy("id", "desc").select("id", "customer_id", "kind", "year", "make", "model", "serial")
    : [];
  return {
    rows: rows.map((r) => ({
      ...toCustomer(r),
      jobCount: Number(r.job_count),
      openJobCount: Number(r.open_job_count),
      lastJobAt: r.last_job_at ? new Date(r.last_job_at) : null,
      machines: machines.filter((m) => Number(m.customer_id) === Number(r.id)).map(toMachine),
    })),
    total,
    page: query.page,
    pageSize,
    pageCount: Math.max(1, Math.ceil(total / pageSize)),
  };
}

export type CustomerJob = {
  id: number;
  number: number;
  status: JobStatus;
  concern: string;
  createdAt: Date;
  updatedAt: Date;
  machineId: number;
};

/** The customer page: their machines (each with its number of jobs) and jobs, newest first, and past merges. Three queries. */
export async function getCustomerDetail({ shopId, customerId }: { shopId: number; customerId: number }) {
  const machines: (Pick<MachinesTable, "id" | "kind" | "year" | "make" | "model" | "serial"> & { job_count: number })[] = await db()("machines as m")
    .where({ "m.shop_id": shopId, "m.customer_id": customerId })
    .select("m.id", "m.kind", "m.year", "m.make", "m.model", "m.serial")
    .select(db().raw("(SELECT COUNT(*) FROM jobs j WHERE j.shop_id = m.shop_id AND j.machine_id = m.id) AS job_count"))
    .orderBy("m.id", "desc");
  const jobs: Pick<JobsTable, "id" | "number" | "status" | "concern" | "created_at" | "updated_at" | "machine_id">[] = await db()("jobs")
    .where({ shop_id: shopId, customer_id: customerId })
    .orderBy("created_at", "desc")
    .orderBy("number", "desc")
    .limit(500)
    .select("id", "number", "status", "concern", "created_at", "updated_at", "machine_id");
  const merges: {
    id: number;
    removed: unknown;
    moved: unknown;
    merged_at: Date;
    by_name: UsersTable["name"] | null;
  }[] = await db()("customer_merges as cm")
    .leftJoin("users as u", "u.id", "cm.merged_by_user_id")
    .where({ "cm.shop_id": shopId, "cm.kept_customer_id": customerId })
    .orderBy("cm.merged_at", "desc")
    .select("cm.id", "cm.removed", "cm.moved", "cm.merged_at", "u.name as by_name");
  return {
    machines: machines.map((m) => ({
      ...toMachine(m),
      jobCount: Number(m.job_count),
    })),
    jobs: jobs.map((j): CustomerJob => ({
      id: Number(j.id),
      number: Number(j.number),
      status: j.status,
      concern: j.concern,
      createdAt: j.created_at,
      updatedAt: j.updated_at,
      machineId: Number(j.machine_id),
    })),
    merges: merges.map((m) => {
      const removed = json(m.removed) as {
        id: number;
        name: string;
        email: string | null;
        phone: string | null;
      };
      const moved = json(m.moved) as { jobIds: number[]; machineIds: number[] };
      return {
        id: Number(m.id),
        removedName: removed.name,
        removedEmail: removed.email,
        jobs: moved.jobIds.length,
        machines: moved.machineIds.length,
        at: m.merged_at,
        by: m.by_name ?? null,
      };
    }),
  };
}

/**
 * New contact details. An e-mail another customer of this shop already has is refused beside the
 * field (two records of one person are merged, not given the same address).
 */
export async function updateCustomerContact(tx: Knex.Transaction, { shopId, customerId, contact }: { shopId: number; customerId: number; contact: ContactInput }) {
  const taken = "Another customer of this shop has that e-mail. If it is the same person, merge the two records instead.";
  if (contact.email) {
    const other = await tx("customers").where({ shop_id: shopId, email: contact.email }).whereNot({ id: customerId }).first("id");
    if (other) throw new AppError("conflict", taken, { email: [taken] });
  }
  const current = await tx("customers").where({ shop_id: shopId, id: customerId }).forUpdate().first("email", "user_id");
  if (!current) throw new AppError("not_found", "No such customer, or it isn't yours to see.");
  // A new address unlinks the sign-in found by the old one; the next check-in or sign-in links it again.
  const userId =
    contact.email === current.email
      ? current.user_id
      : ((
          await tx("users")
            .where({ email: contact.email ?? "" })
            .first("id")
        )?.id ?? null);
  try {
    await tx("customers").where({ shop_id: shopId, id: customerId }).update({
      name: contact.name,
      email: contact.email,
      phone: contact.phone,
      contact_preference: contact.contactPreference,
      user_id: userId,
    });
  } catch (error) {
    if ((error as { code?: string }).code === "ER_DUP_ENTRY") throw new AppError("conflict", taken, { email: [taken] });
    throw error;
  }
}
