import type { Metadata } from "next";
import { CircleCheck, EyeOff, ImageOff } from "lucide-react";
import { getStoryForJob, listConsents } from "@/db/queries/portfolio";
import { getShopBySlug } from "@/db/queries/shops";
import { ButtonLink, Card, EmptyState, PageHeader } from "@/components/ui";
import { describeMachine } from "@/lib/machine";
import { CONSENT_DECISIONS, CONSENT_FROM, OWNER_STATUS_WORDS, storyPath } from "@/lib/portfolio";
import { loadPage } from "@/lib/server/page-access";
import { StoryView } from "@/components/portfolio/story-view";
import { storyContentHash } from "@/lib/server/portfolio";
import { previewStory } from "@/lib/server/portfolio-public";
import { ConsentForm } from "./_components/consent-form";

export const metadata: Metadata = { title: "Show this job in public?" };

/** The machine owner's answer to the shop's request to show a finished job in public. */
export default async function PortfolioConsentPage({ params }: { params: Promise<{ job: string }> }) {
  const { job: publicId } = await params;
  const { job } = await loadPage("job", { job: publicId }, "portfolio:consent", `/my/jobs/${publicId}/portfolio`);
  const story = await getStoryForJob({ shopId: job.shopId, jobId: job.id });
  const machine = describeMachine(job.machine);
  const header = <PageHeader title="Show this job in public?" description={`${job.shopName} · ${machine}`} back={{ href: `/my/jobs/${job.publicId}`, label: "Back to the job" }} />;
  if (!story) {
    return (
      <div className="space-y-4">
        {header}
        <EmptyState icon={ImageOff} title="Nothing to answer" description={`${job.shopName} hasn't asked to show this job. If they do, you'll get an e-mail and the question appears here.`} />
      </div>
    );
  }
  const [consents, preview, shownHash] = await Promise.all([
    listConsents({ shopId: story.shopId, storyId: story.id }),
    previewStory({ shopId: story.shopId, storyId: story.id, shopSlug: job.shopSlug }),
    storyContentHash(story),
  ]);
  const allowed = CONSENT_DECISIONS.filter((d) => CONSENT_FROM[d].includes(story.status));
  const timeZone = (await getShopBySlug({ slug: job.shopSlug }))?.timezone ?? "UTC";
  const when = new Intl.DateTimeFormat("en-US", { dateStyle: "medium", timeStyle: "short", timeZone });
  return (
    <div className="space-y-4">
      {header}
      <Card as="section" title="What the shop would show" headingId="what-shown">
        <ul className="list-disc space-y-1 pl-6">
          <li>A title and a short write-up of the work on your {machine}.</li>
          <li>Photos and clips from the bench that were already shared with you, and torque records of the work.</li>
        </ul>
        <h3 className="mt-3 font-semibold text-ink">Never shown</h3>
        <ul className="list-disc space-y-1 pl-6">
          <li>Your name, your contact details, the serial number or VIN, plates.</li>
          <li>Prices, estimates, the invoice, or anything the shop kept to itself.</li>
          <li>Where a photo was taken: photos carry no location data.</li>
        </ul>
      </Card>
      {preview && story.status !== "proposed" ? (
        <section aria-labelledby="story-preview-heading" className="space-y-3 rounded-xl border border-line bg-surface p-4 sm:p-6">
          <h2 id="story-preview-heading" className="text-lg font-bold text-ink">
            The story as the public would see it
          </h2>
          <p className="text-ink-muted">Your answer is about this version. If the shop changes it, you are asked again.</p>
          <StoryView story={preview} />
        </section>
      ) : null}
      <Card as="section" title="Your answer" headingId="your-answer" description={`Now: ${OWNER_STATUS_WORDS[story.status]} You can change your answer at any time; withdrawing takes the story down at once.`}>
        <div className="space-y-4">
          {story.status === "published" ? (
            <p className="flex flex-wrap items-center gap-2">
              <CircleCheck aria-hidden className="size-5 text-moss" />
              <ButtonLink href={storyPath(job.shopSlug, story.slug)} variant="secondary">
                See the public story
              </ButtonLink>
            </p>
          ) : story.status === "withdrawn" || story.status === "declined" ? (
            <p className="flex items-center gap-2 text-ink">
              <EyeOff aria-hidden className="size-5 text-ink-muted" />
              Not public.
            </p>
          ) : null}
          <ConsentForm jobPublicId={job.publicId} ownerName={job.customerName} allowed={allowed} shownHash={shownHash} />
        </div>
      </Card>
      {consents.length ? (
        <Card as="section" title="Your answers so far" headingId="answers-so-far">
          <ul className="space-y-1">
            {consents.map((c, i) => (
              <li key={i}>
                {when.format(c.at)}: {c.decision === "given" ? "you agreed" : c.decision === "refused" ? "you said no" : "you withdrew consent"}, signed “{c.name}”
              </li>
            ))}
          </ul>
        </Card>
      ) : null}
    </div>
  );
}
