import { z } from "zod";
import { JOB_STATUSES } from "@/lib/job-status";

export const JOB_SORTS = ["number", "status", "promised", "customer", "updated"] as const;
export const PAGE_SIZES = [10, 25, 50, 100] as const;

/** A list in a query string: repeated keys or comma-separated, known values only, no duplicates. */
export function listParam<const T extends readonly [string, ...string[]]>(values: T, unknownLabel: string) {
  return z.union([z.enum(values), z.array(z.enum(values)), z.string()]).transform((v, ctx) => {
    const list = Array.isArray(v) ? v : v.split(",").filter(Boolean);
    const bad = list.filter((s) => !(values as readonly string[]).includes(s));
    if (bad.length) {
      ctx.addIssue({ code: "custom", message: `${unknownLabel}: ${bad.join(", ")}` });
      return z.NEVER;
    }
    return [...new Set(list)] as T[number][];
  });
}

/**
 * Quick filters for jobs that need someone to act: past their promised date while still in
 * the shop, or held up waiting on parts. Several together show jobs with any of them.
 */
export const JOB_ATTENTION = ["overdue", "waiting_parts", "answered", "ready_unpaid", "owner_slow"] as const;
export type JobAttention = (typeof JOB_ATTENTION)[number];

/** Query of the shop's job table (search params of the page and of GET /api/shops/[shop]/jobs). */
export const jobListQuerySchema = z.object({
  q: z.string().trim().max(100, "Search is limited to 100 characters").optional().default(""),
  status: listParam(JOB_STATUSES, "Unknown status").optional().default([]),
  attention: listParam(JOB_ATTENTION, "Unknown quick filter").optional().default([]),
  technician: z.coerce.number().int().positive().optional(),
  sort: z.enum(JOB_SORTS).optional().default("updated"),
  dir: z.enum(["asc", "desc"]).optional().default("desc"),
  page: z.coerce.number().int().min(1).max(100_000).optional().default(1),
  pageSize: z.coerce
    .number()
    .int()
    .refine((n) => (PAGE_SIZES as readonly number[]).includes(n), "Page size must be 10, 25, 50 or 100")
    .optional()
    .default(25),
});

export type JobListQuery = z.output<typeof jobListQuerySchema>;

/** Job numbers as people write them: "J-0042", "j42", "42". */
export const jobNumberParamSchema = z
  .string()
  .regex(/^(?:[jJ]-?)?\d{1,9}$/, "Not a job number")
  .transform((s) => Number(s.replace(/^[jJ]-?/, "")));

export function formatJobNumber(n: number): string {
  return `J-${String(n).padStart(4, "0")}`;
}

/**
 * The job page's status form (changeStatusAction adds `job`): "from" is the status the page
 * showed, filled by the page; a stale or tampered one is said in the form's banner.
 */
export const statusChangeFields = z.object({
  from: z.enum(JOB_STATUSES, { message: "The job's status changed meanwhile: reload the page and try again." }),
  to: z.enum(JOB_STATUSES, { message: "Choose where the job goes next." }),
  note: z
    .string({ message: "The form sent no note field: reload the page and try again." })
    .trim()
    .max(500, "Keep the note under 500 characters.")
    .transform((s) => s || null),
  // Handing back before the invoice is paid: why (recorded in the history).
  override: z
    .string()
    .trim()
    .max(300, "Keep the reason under 300 characters.")
    .optional()
    .transform((s) => s || null),
});
