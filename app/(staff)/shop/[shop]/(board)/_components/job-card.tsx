import Link from "next/link";
import { TriangleExclamationPoint } from "lucide-react";
import clsx from "clsx";
import { StatusBadge } from "@/components/status-badge";
import { Badge } from "@/components/ui";
import { WAITING_ON_LABEL } from "@/lib/job-workflow";
import { type JobBoardRow, daysOverdue, jobAttention, overdueLabel, waitedFor } from "@/lib/jobs-view";
import { type JobAttention, formatJobNumber } from "@/lib/schemas/jobs";

/**
 * How a job that needs attention stands out: a tint and a bar at its start edge, on top of
 * the words and icons ("Overdue 3 days", "Waiting on parts") that carry the meaning.
 */
export function attentionClasses(flags: JobAttention[]): { tint?: string; edge?: string } {
  if (flags.includes("overdue")) return { tint: "bg-rust-soft/40", edge: "border-l-4 border-l-rust" };
  if (flags.includes("owner_slow") || flags.includes("answered") || flags.includes("ready_unpaid")) return { tint: "bg-signal-soft/40", edge: "border-l-4 border-l-signal" };
  if (flags.includes("waiting_parts")) return { tint: "bg-signal-soft/40", edge: "border-l-4 border-l-signal" };
  return {};
}

/** Whom the job waits on, for how long, and the next thing to do. */
export function WaitsOn({ row }: { row: Pick<JobBoardRow, "waitingOn" | "next" | "since" | "answeredNotStarted"> }) {
  if (!row.waitingOn) return <span className="text-ink-muted">Nobody</span>;
  return (
    <div className="space-y-0.5" data-testid="waits-on">
      <div className="whitespace-nowrap font-medium">
        {WAITING_ON_LABEL[row.waitingOn]} · <time dateTime={row.since}>{waitedFor(row.since)}</time>
      </div>
      <div className="text-sm text-ink-muted">{row.answeredNotStarted ? "Owner answered: start the work" : row.next}</div>
    </div>
  );
}

/** "Overdue 3 days" with a warning icon, or nothing while the job is on time. */
export function OverdueBadge({ row, today }: { row: Pick<JobBoardRow, "status" | "promisedOn">; today: string }) {
  const days = daysOverdue(row, today);
  if (days == null) return null;
  return (
    <Badge tone="rust" icon={TriangleExclamationPoint}>
      {overdueLabel(days)}
    </Badge>
  );
}

/** One job of the board as a thumb-sized card, for narrow screens. */
export function JobCard({ row, shopSlug, today }: { row: JobBoardRow; shopSlug: string; today: string }) {
  const look = attentionClasses(jobAttention(row, today));
  return (
    <Link
      href={`/shop/${shopSlug}/jobs/${row.number}`}
      className={clsx("block space-y-2 rounded-xl border border-line p-4 hover:bg-sunken", look.tint ?? "bg-surface", look.edge)}
    >
      <div className="flex flex-wrap items-center justify-between gap-2">
        <span className="font-semibold text-oil">{formatJobNumber(row.number)}</span>
        <StatusBadge status={row.status} />
      </div>
      <div className="font-medium">{row.machine}</div>
      <div className="text-sm text-ink-muted">
        {row.customerName} · {row.technician ?? "Unassigned"}
      </div>
      <p className="line-clamp-2 text-sm">{row.concern}</p>
      <WaitsOn row={row} />
      {row.promisedOn ? (
        <div className="flex flex-wrap items-center gap-2 text-sm">
          <span>Promised {row.promisedOn}</span>
          <OverdueBadge row={row} today={today} />
        </div>
      ) : null}
    </Link>
  );
}
