import { Images } from "lucide-react";
import { ActionButton } from "@/components/bench/action-form";
import { ButtonLink, Card } from "@/components/ui";
import { getStoryForJob } from "@/db/queries/portfolio";
import type { JobStatus } from "@/lib/job-status";
import { type Actor, can } from "@/lib/permissions";
import { proposeAction } from "../actions";
import { StoryStatusBadge } from "./story-status";

/**
 * On a collected job's page, for the desk: propose it for the public portfolio (the owner is
 * asked by e-mail), or see where its story stands. Nothing for other jobs or other roles.
 */
export async function PortfolioJobCard({ actor, shop, job }: { actor: Actor; shop: { id: number; slug: string }; job: { id: number; publicId: string; status: JobStatus } }) {
  if (job.status !== "picked_up" || !can(actor, "portfolio:propose", { shopId: shop.id })) return null;
  const story = await getStoryForJob({ shopId: shop.id, jobId: job.id });
  return (
    <Card as="section" title="Public portfolio" headingId="job-portfolio">
      {story ? (
        <div className="flex flex-wrap items-center gap-3">
          <StoryStatusBadge status={story.status} />
          <ButtonLink href={`/shop/${shop.slug}/portfolio/${story.id}`} variant="secondary">
            Open the story
          </ButtonLink>
        </div>
      ) : (
        <div className="space-y-3">
          <p>Show this job on the shop&apos;s public page. The owner is asked first, by e-mail; nothing goes public without their yes.</p>
          <ActionButton action={proposeAction} fields={{ shop: shop.slug, job: job.publicId }} variant="primary" icon={<Images aria-hidden className="size-5" />}>
            Propose for the portfolio
          </ActionButton>
        </div>
      )}
    </Card>
  );
}
