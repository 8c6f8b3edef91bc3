import { BellOff, Users } from "lucide-react";
import { Badge, Card } from "@/components/ui";
import { FREQUENCY_LABEL, MAX_FOLLOWERS } from "@/lib/following";
import type { Actor, Resource } from "@/lib/permissions";
import { followingView } from "@/lib/server/following";
import { FrequencyForm, InviteFollowerForm, RemoveFollowerButton } from "./following-forms";

/**
 * E-mail about this job: how often this person hears, and for the owner, who else follows it.
 * The card's heading id is the "#following" the e-mails' "choose how often" link opens.
 */
export async function FollowingCard({ actor, job, resource }: { actor: Actor; job: { id: number; shopId: number; customerUserId: number | null; publicId: string }; resource: Resource }) {
  const view = await followingView(actor, job, resource);
  if (!view.mayFollow) return null;
  const stopped = !view.own || view.own.unsubscribedAt != null;
  return (
    <Card as="section" title="E-mail updates" headingId="following" description="Updates shared close together come as one e-mail; pick-up and approvals come at once.">
      <div className="space-y-6">
        <FrequencyForm jobPublicId={job.publicId} current={stopped ? null : view.own!.frequency} />
        {view.mayManage ? (
          <section aria-labelledby="followers-heading" className="space-y-3 border-t border-line pt-4">
            <h3 id="followers-heading" className="flex items-center gap-2 font-bold text-ink">
              <Users aria-hidden className="size-5 text-oil" />
              People following this job
            </h3>
            <p className="text-sm text-ink-muted">
              Family, a riding buddy or a fleet manager can follow along: they see the notes, photos and status the shop shares with you, never prices or your answers. Up to {MAX_FOLLOWERS} people.
            </p>
            {view.followers.length ? (
              <ul className="divide-y divide-line" aria-label="Followers">
                {view.followers.map((f) => (
                  <li key={f.id} data-testid="follower" className="flex flex-wrap items-center justify-between gap-2 py-2">
                    <span className="min-w-0 break-all">
                      <span className="font-semibold">{f.email}</span>
                      <span className="ml-2 text-sm text-ink-muted">{f.unsubscribedAt ? "" : FREQUENCY_LABEL[f.frequency]}</span>
                      {f.unsubscribedAt ? (
                        <Badge tone="neutral" icon={BellOff} className="ml-2">
                          E-mail stopped
                        </Badge>
                      ) : null}
                    </span>
                    <RemoveFollowerButton jobPublicId={job.publicId} subscriberId={f.id} email={f.email} />
                  </li>
                ))}
              </ul>
            ) : (
              <p className="text-ink-muted">Nobody else follows this job yet.</p>
            )}
            <InviteFollowerForm jobPublicId={job.publicId} />
          </section>
        ) : null}
      </div>
    </Card>
  );
}
