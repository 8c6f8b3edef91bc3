import Link from "next/link";
import { TBody, TD, TH, THead, TR, Table } from "@/components/ui";
import { StatusBadge } from "@/components/status-badge";
import type { JobStatus } from "@/lib/job-status";
import { formatJobNumber } from "@/lib/schemas/jobs";

export const LINK_CLASS = "inline-flex min-h-tap items-center font-semibold text-oil underline underline-offset-2 hover:no-underline";

/** A link to a staff job page by number. */
export function JobLink({ shopSlug, number }: { shopSlug: string; number: number }) {
  return (
    <Link href={`/shop/${shopSlug}/jobs/${number}`} className={LINK_CLASS}>
      {formatJobNumber(number)}
    </Link>
  );
}

type JobLine = { number: number; createdAt: Date; status: JobStatus; concern: string; machine?: string };

/** Jobs newest first, each linked to its page (the customer page adds the machine column). */
export function JobsTable({ label, shopSlug, timeZone, jobs, showMachine = false }: { label: string; shopSlug: string; timeZone: string; jobs: JobLine[]; showMachine?: boolean }) {
  const day = new Intl.DateTimeFormat("en-US", { timeZone, month: "short", day: "numeric", year: "numeric" });
  return (
    <Table label={label}>
      <THead>
        <TR>
          <TH>Job</TH>
          <TH>Checked in</TH>
          {showMachine ? <TH>Machine</TH> : null}
          <TH>Status</TH>
          <TH>Concern</TH>
        </TR>
      </THead>
      <TBody>
        {jobs.map((j) => (
          <TR key={j.number}>
            <TD className="whitespace-nowrap">
              <JobLink shopSlug={shopSlug} number={j.number} />
            </TD>
            <TD className="whitespace-nowrap">{day.format(j.createdAt)}</TD>
            {showMachine ? <TD>{j.machine ?? "—"}</TD> : null}
            <TD>
              <StatusBadge status={j.status} />
            </TD>
            <TD className="max-w-md">{j.concern.length > 140 ? `${j.concern.slice(0, 140)}…` : j.concern}</TD>
          </TR>
        ))}
      </TBody>
    </Table>
  );
}
