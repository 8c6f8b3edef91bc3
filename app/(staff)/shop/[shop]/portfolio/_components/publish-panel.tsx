import { ExternalLink, Eye, EyeOff, Send } from "lucide-react";
import { ActionButton } from "@/components/bench/action-form";
import { ButtonLink, Card } from "@/components/ui";
import type { ConsentRow, StoryRow } from "@/db/queries/portfolio";
import { PUBLISHABLE_FROM, storyPath } from "@/lib/portfolio";
import { askOwnerAction, publishAction, unpublishAction } from "../actions";
import { StoryStatusBadge } from "./story-status";

const DECISION_WORDS = { given: "agreed", refused: "said no", withdrawn: "withdrew consent" } as const;

/** Where the story stands, the owner's answers on record, and the one next step this person may take. */
export function PublishPanel({ shopSlug, story, consents, mayPublish, timeZone }: { shopSlug: string; story: StoryRow; consents: ConsentRow[]; mayPublish: boolean; timeZone: string }) {
  const when = new Intl.DateTimeFormat("en-US", { timeZone, dateStyle: "medium", timeStyle: "short" });
  const fields = { shop: shopSlug, story: String(story.id) };
  const next = (() => {
    if (story.status === "published") {
      return (
        <div className="flex flex-wrap gap-2">
          <ButtonLink href={storyPath(shopSlug, story.slug)} variant="secondary" icon={<ExternalLink aria-hidden className="size-5" />}>
            See it in public
          </ButtonLink>
          <ActionButton action={unpublishAction} fields={fields} icon={<EyeOff aria-hidden className="size-5" />}>
            Take it down
          </ActionButton>
        </div>
      );
    }
    if (PUBLISHABLE_FROM.includes(story.status)) {
      return mayPublish ? (
        <ActionButton action={publishAction} fields={fields} variant="primary" icon={<Eye aria-hidden className="size-5" />}>
          Publish
        </ActionButton>
      ) : (
        <p className="text-ink-muted">The owner agreed. The shop owner publishes it.</p>
      );
    }
    if (story.status === "proposed") {
      return story.customer.email ? (
        <div className="space-y-2">
          <p className="text-ink-muted">Write the story first: the owner is shown it as the public will see it, and agrees to that version.</p>
          <ActionButton action={askOwnerAction} fields={fields} variant="primary" icon={<Send aria-hidden className="size-5" />} done="Asked.">
            Ask the owner by e-mail
          </ActionButton>
        </div>
      ) : (
        <p className="text-ink-muted">The owner has no e-mail address on file: add one to their record to ask them.</p>
      );
    }
    if (story.status === "consent_requested") return <p className="text-ink-muted">The owner was asked by e-mail and on their job page, and sees the story as the public would. Nothing is public until they agree; saving changes asks them about the new version.</p>;
    return <p className="text-ink-muted">The owner didn&apos;t agree: this story stays private unless they change their mind.</p>;
  })();
  return (
    <Card as="section" title="Consent and publishing" headingId="story-publishing">
      <div className="space-y-3">
        <StoryStatusBadge status={story.status} />
        {next}
        {consents.length ? (
          <div>
            <h3 className="font-semibold text-ink">The owner&apos;s answers</h3>
            <ul className="mt-1 space-y-1 text-ink">
              {consents.map((c, i) => (
                <li key={i}>
                  {when.format(c.at)}: {DECISION_WORDS[c.decision]}, signed “{c.name}”
                </li>
              ))}
            </ul>
          </div>
        ) : null}
      </div>
    </Card>
  );
}
