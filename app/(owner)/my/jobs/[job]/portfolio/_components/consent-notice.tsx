import { Images } from "lucide-react";
import { ButtonLink, Card } from "@/components/ui";
import { getStoryForJob } from "@/db/queries/portfolio";
import { type Actor, type Resource, can } from "@/lib/permissions";
import { OWNER_STATUS_WORDS } from "@/lib/portfolio";

/**
 * On the owner's job page: the shop's request to show the job in public, or where the owner's
 * answer stands, with the way to answer or change it. Only for the machine's owner.
 */
export async function PortfolioConsentNotice({ actor, job, resource }: { actor: Actor; job: { id: number; shopId: number; publicId: string; shopName: string }; resource: Resource }) {
  if (!can(actor, "portfolio:consent", resource)) return null;
  const story = await getStoryForJob({ shopId: job.shopId, jobId: job.id });
  if (!story) return null;
  const asking = story.status === "consent_requested" || story.status === "proposed";
  return (
    <Card as="section" title={asking ? `${job.shopName} would like to show this job` : "Public portfolio"} headingId="portfolio-consent" className={asking ? "border-2 border-brass" : undefined}>
      <div className="flex flex-wrap items-center gap-3">
        <Images aria-hidden className="size-6 text-brass" />
        <p className="min-w-0 flex-1">{asking ? "Photos and clips of the work, never your name, serial number or prices. Nothing goes public unless you say yes." : OWNER_STATUS_WORDS[story.status]}</p>
        <ButtonLink href={`/my/jobs/${job.publicId}/portfolio`} variant={asking ? "primary" : "secondary"}>
          {asking ? "Answer the shop" : "See or change your answer"}
        </ButtonLink>
      </div>
    </Card>
  );
}
