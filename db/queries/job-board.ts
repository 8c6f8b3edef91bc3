import "server-only";
import type { Knex } from "knex";
import { JOB_STATUSES, type JobStatus } from "@/lib/job-status";
import { DONE_STATUSES } from "@/lib/jobs-view";
import type { JobAttention, JobListQuery } from "@/lib/schemas/jobs";
import { searchHits } from "./job-search";

// The job board's SQL (listJobs in jobs.ts): its filters, its orders and what it adds to each row,
// laid on the indexes of migration 21 (issue 17).

// What the board adds to each job, as correlated subqueries on indexed keys so a page stays one
// query: since when the job is in its status, the cause of its last move, its live invoice's state.
// Each names the shop too, so it reads the (shop_id, job_id) indexes.
export const SINCE = "COALESCE((SELECT MAX(sc.changed_at) FROM job_status_changes sc WHERE sc.job_id = j.id), j.created_at)";
const LAST_CAUSE = "(SELECT sc.cause FROM job_status_changes sc WHERE sc.shop_id = j.shop_id AND sc.job_id = j.id ORDER BY sc.id DESC LIMIT 1)";
export const INVOICE_STATE =
  "(SELECT CASE WHEN i.status = 'draft' THEN 'draft' WHEN i.status = 'paid' OR i.balance_minor <= 0 THEN 'paid' ELSE 'issued' END FROM invoices i WHERE i.shop_id = j.shop_id AND i.job_id = j.id AND i.status <> 'void' ORDER BY i.id DESC LIMIT 1)";
export const OWNER_WAIT_DAYS = "(SELECT s.owner_wait_days FROM shops s WHERE s.id = j.shop_id)";
/** Owner answered and the job went back to the bench, but nobody has recorded bench work since. */
export const ANSWERED_NOT_STARTED = `j.status = 'in_progress' AND ${LAST_CAUSE} = 'request_answered' AND NOT EXISTS (SELECT 1 FROM journal_entries e WHERE e.job_id = j.id AND e.kind NOT IN ('status', 'approval') AND e.created_at > ${SINCE})`;

export type BoardExtras = { since: Date; invoiceState: "none" | "draft" | "issued" | "paid"; ownerWaitDays: number; answeredNotStarted: boolean };

/** Still in the shop: a passed promised date counts against these. */
const OPEN_STATUSES = JOB_STATUSES.filter((s) => !DONE_STATUSES.includes(s));
/**
 * The statuses each quick filter can match. Every filter is a status range of the
 * (shop_id, status, …) indexes first, so it reads the shop's jobs in those statuses only, never
 * its whole history; overdue is open AND promised before today, a range of (shop_id, status, promised_on).
 */
const ATTENTION_STATUSES: Record<JobAttention, readonly JobStatus[]> = {
  overdue: OPEN_STATUSES,
  waiting_parts: ["waiting_parts"],
  answered: ["in_progress"],
  ready_unpaid: ["ready"],
  owner_slow: ["waiting_approval"],
};

/**
 * The order of each sort, all on jobs' own columns so an index of migration 21 gives it: undated
 * jobs last whichever way (promised_undated, generated), the owner's name as copied onto the job,
 * and the newest job number first among equals.
 */
export function boardOrder(sort: JobListQuery["sort"], dir: "asc" | "desc"): { column: string; order: "asc" | "desc" }[] {
  const newestFirst = { column: "j.number", order: "desc" as const };
  switch (sort) {
    case "number":
      return [{ column: "j.number", order: dir }];
    case "promised":
      return [{ column: "j.promised_undated", order: "asc" }, { column: "j.promised_on", order: dir }, newestFirst];
    case "status":
      return [{ column: "j.status", order: dir }, newestFirst];
    case "customer":
      return [{ column: "j.customer_name", order: dir }, newestFirst];
    case "updated":
      return [{ column: "j.updated_at", order: dir }, newestFirst];
  }
}

/** The indexes of migration 21 (and the number key) that give the board's orders. */
const ORDER_INDEXES = [
  "jobs_shop_id_number_unique",
  ...["updated", "status", "promised", "customer"].flatMap((s) => [`jobs_board_${s}_desc`, `jobs_board_${s}_asc`]),
  "jobs_board_status_updated",
  "jobs_board_technician_updated",
];

/** The index of migration 21 (or the number key) whose order is the sort's. */
function orderIndex(sort: JobListQuery["sort"], dir: "asc" | "desc"): string {
  return sort === "number" ? "jobs_shop_id_number_unique" : `jobs_board_${sort}_${dir}`;
}

/** The columns of jobs the board's page picks and sorts on: what a search branch hands on. */
const SEARCH_COLUMNS = ["j.id", "j.shop_id", "j.number", "j.status", "j.updated_at", "j.promised_undated", "j.promised_on", "j.customer_name"];

/**
 * The shop's jobs that pass the board's filters and search, on jobs alone, as `j` (with a search:
 * the union of its branches under that name, each branch filtered, with the columns of SEARCH_COLUMNS).
 * `anySmall`: whether the search's number and prefix branches find anything (smallSearch), asked first.
 */
export function boardJobs(k: Knex, shopId: number, query: JobListQuery, today: string, anySmall = true): Knex.QueryBuilder {
  // Which rows to read first, said to the optimizer so the plan can't drift with statistics:
  // - a search: each branch its own index (db/queries/job-search.ts), then the hits sorted; a quick
  //   filter: its status ranges, sorted. Both are a few rows of the shop's jobs; walking the whole
  //   history in page order hoping to meet them (which ORDER BY … LIMIT may tempt the optimizer
  //   into) is not.
  // - no filter at all: every job is a candidate, so the sort's own index, even for a deep page
  //   (which the optimizer may otherwise read whole and sort).
  if (query.q) {
    const branch = () => filtered(k("jobs as j").select(SEARCH_COLUMNS), shopId, query, today);
    const hits = searchHits(query.q, anySmall, branch);
    return "single" in hits ? hits.single.clearSelect() : k.from(hits.union.as("j"));
  }
  const unfiltered = !query.attention.length && !query.status.length && !query.technician;
  const jobs: Knex.QueryBuilder = query.attention.length
    ? k.from(k.raw(`jobs AS j IGNORE INDEX FOR ORDER BY (${ORDER_INDEXES.join(", ")})`))
    : unfiltered
      ? k.from(k.raw(`jobs AS j FORCE INDEX FOR ORDER BY (${orderIndex(query.sort, query.dir)})`))
      : k("jobs as j");
  return filtered(jobs, shopId, query, today);
}

/** The shop's jobs (alias j) narrowed by the board's status, quick and technician filters. */
function filtered(jobs: Knex.QueryBuilder, shopId: number, query: JobListQuery, today: string): Knex.QueryBuilder {
  jobs.where("j.shop_id", shopId);
  if (query.status.length) jobs.whereIn("j.status", query.status);
  if (query.attention.length) {
    jobs.whereIn("j.status", [...new Set(query.attention.flatMap((a) => ATTENTION_STATUSES[a]))]);
    // Any of the chosen quick filters.
    jobs.where((w) => {
      if (query.attention.includes("overdue")) w.orWhere((o) => o.whereIn("j.status", OPEN_STATUSES).where("j.promised_on", "<", today));
      if (query.attention.includes("waiting_parts")) w.orWhere("j.status", "waiting_parts");
      if (query.attention.includes("answered")) w.orWhereRaw(ANSWERED_NOT_STARTED);
      if (query.attention.includes("ready_unpaid")) w.orWhere((o) => o.where("j.status", "ready").whereRaw(`COALESCE(${INVOICE_STATE}, 'none') <> 'paid'`));
      if (query.attention.includes("owner_slow")) {
        w.orWhere((o) => o.where("j.status", "waiting_approval").whereRaw(`${SINCE} <= NOW(3) - INTERVAL ${OWNER_WAIT_DAYS} DAY`));
      }
    });
  }
  if (query.technician) jobs.where("j.technician_user_id", query.technician);
  return jobs;
}
