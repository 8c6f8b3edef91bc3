import { BellOff, Mail } from "lucide-react";
import { listSubscribers } from "@/db/queries/following";
import { Badge, Card } from "@/components/ui";
import { FREQUENCY_LABEL } from "@/lib/following";

/** Who hears about this job by e-mail (the owner and the people they invited), for the shop's staff. Read-only: the owner manages followers. */
export async function FollowersCard({ shopId, jobId }: { shopId: number; jobId: number }) {
  const subscribers = await listSubscribers({ shopId, jobId });
  return (
    <Card as="section" title="Following this job" headingId="job-followers" description="Shared entries reach them by e-mail; followers never see prices or the owner's answers.">
      {subscribers.length ? (
        <ul className="divide-y divide-line" aria-label="People following this job">
          {subscribers.map((s) => (
            <li key={s.id} className="flex flex-wrap items-center gap-x-3 gap-y-1 py-2">
              <span className="break-all font-semibold">{s.email}</span>
              <span className="text-sm text-ink-muted">{s.role === "owner" ? "Owner" : "Follower"}</span>
              {s.unsubscribedAt ? (
                <Badge tone="neutral" icon={BellOff}>
                  E-mail stopped
                </Badge>
              ) : (
                <Badge tone="oil" icon={Mail}>
                  {FREQUENCY_LABEL[s.frequency]}
                </Badge>
              )}
            </li>
          ))}
        </ul>
      ) : (
        <p className="text-ink-muted">Nobody gets e-mail about this job: the owner has no e-mail address on file.</p>
      )}
    </Card>
  );
}
