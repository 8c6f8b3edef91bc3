import Link from "next/link";
import { listFollowedJobs } from "@/db/queries/following";
import { StatusBadge } from "@/components/status-badge";
import { describeMachine } from "@/lib/machine";
import { formatJobNumber } from "@/lib/schemas/jobs";

/** Jobs someone invited this person to follow (not their own machines); nothing when there are none. */
export function FollowedJobs({ jobs }: { jobs: Awaited<ReturnType<typeof listFollowedJobs>> }) {
  if (!jobs.length) return null;
  return (
    <section aria-labelledby="followed-heading" className="space-y-3">
      <h2 id="followed-heading" className="text-xl font-bold text-ink">
        Jobs you follow
      </h2>
      <ul className="space-y-3" aria-label="Jobs I follow">
        {jobs.map((job) => (
          <li key={job.id} data-testid="followed-job">
            <Link href={`/my/jobs/${job.publicId}`} className="block space-y-2 rounded-xl border border-line bg-surface p-4 hover:bg-sunken focus-visible:bg-sunken">
              <div className="flex flex-wrap items-center justify-between gap-2">
                <span className="text-lg font-semibold">{describeMachine(job.machine)}</span>
                <StatusBadge status={job.status} />
              </div>
              <p className="text-ink-muted">
                {job.shopName} · {formatJobNumber(job.number)}
              </p>
            </Link>
          </li>
        ))}
      </ul>
    </section>
  );
}
