import type { Metadata } from "next";
import Link from "next/link";
import { Bike } from "lucide-react";
import { listJobsForCustomerUser } from "@/db/queries/jobs";
import { StatusBadge } from "@/components/status-badge";
import { EmptyState, PageHeader } from "@/components/ui";
import { describeMachine } from "@/lib/machine";
import { formatJobNumber } from "@/lib/schemas/jobs";
import { requirePageActor } from "@/lib/server/authorize";
import { listFollowedJobs } from "@/db/queries/following";
import { FollowedJobs } from "./_components/followed-jobs";

export const metadata: Metadata = { title: "My machines" };

/** The machine owner's home: their jobs at every shop that knows their e-mail, open ones first, then jobs they follow. */
export default async function MyJobsPage() {
  const actor = await requirePageActor("/my");
  const jobs = await listJobsForCustomerUser({ userId: actor.userId });
  const followed = await listFollowedJobs({ userId: actor.userId });
  return (
    <div className="space-y-4">
      <PageHeader title="My machines" description={`Signed in as ${actor.email}`} />
      {jobs.length === 0 && followed.length === 0 ? (
        <EmptyState
          icon={Bike}
          title="No jobs under this address"
          description="When a shop checks in your machine with this e-mail address, its job appears here."
        />
      ) : jobs.length === 0 ? null : (
        <ul className="space-y-3" aria-label="My jobs">
          {jobs.map((job) => (
            <li key={job.id} data-testid="my-job">
              <Link
                href={`/my/jobs/${job.publicId}`}
                className="block space-y-2 rounded-xl border border-line bg-surface p-4 hover:bg-sunken focus-visible:bg-sunken"
              >
                <div className="flex flex-wrap items-center justify-between gap-2">
                  <span className="text-lg font-semibold">{describeMachine(job.machine)}</span>
                  <StatusBadge status={job.status} />
                </div>
                <p className="text-ink-muted">
                  {job.shopName} · {formatJobNumber(job.number)}
                  {job.promisedOn ? ` · promised ${job.promisedOn}` : ""}
                </p>
                <p className="line-clamp-2">{job.concern}</p>
              </Link>
            </li>
          ))}
        </ul>
      )}
      {jobs.length ? (
        // Each shop's way of reaching them (issue 21): e-mail, text or both, set on a job of that shop.
        <nav aria-label="E-mail or texts" className="space-y-1">
          {[...new Map(jobs.map((j) => [j.shopName, j.publicId])).entries()].map(([shopName, publicId]) => (
            <Link key={publicId} href={`/my/jobs/${publicId}/texts`} className="flex min-h-tap items-center text-oil underline underline-offset-2">
              E-mail or texts from {shopName}
            </Link>
          ))}
        </nav>
      ) : null}
      <FollowedJobs jobs={followed} />
    </div>
  );
}
