import Link from "next/link";
import { Clock } from "lucide-react";
import clsx from "clsx";
import { StatusBadge } from "@/components/status-badge";
import { Badge } from "@/components/ui";
import type { JobBoardRow } from "@/lib/jobs-view";
import { formatJobNumber } from "@/lib/schemas/jobs";

/** One job of the board as a thumb-sized card, for narrow screens. */
export function JobCard({ row, shopSlug, overdue }: { row: JobBoardRow; shopSlug: string; overdue: boolean }) {
  return (
    <Link
      href={`/shop/${shopSlug}/jobs/${row.number}`}
      className={clsx("block space-y-2 rounded-xl border border-line p-4 hover:bg-sunken", overdue ? "bg-rust-soft/40" : "bg-surface")}
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
      {row.promisedOn ? (
        <div className="flex items-center gap-2 text-sm">
          <span>Promised {row.promisedOn}</span>
          {overdue ? (
            <Badge tone="rust" icon={Clock}>
              Overdue
            </Badge>
          ) : null}
        </div>
      ) : null}
    </Link>
  );
}
