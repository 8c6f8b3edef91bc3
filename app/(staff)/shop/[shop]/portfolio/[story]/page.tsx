import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getStory, listConsents, listItems } from "@/db/queries/portfolio";
import { Caution, PageHeader } from "@/components/ui";
import { describeMachine } from "@/lib/machine";
import { can } from "@/lib/permissions";
import { formatJobNumber } from "@/lib/schemas/jobs";
import { curationChoices } from "@/lib/server/portfolio-curation";
import { shopPageAccess } from "../../shop-access";
import { CurationForm } from "../_components/curation-form";
import { PublishPanel } from "../_components/publish-panel";

export const metadata: Metadata = { title: "Story" };

/** Curating one story and moving it towards (or out of) public view. */
export default async function StoryCurationPage({ params }: { params: Promise<{ shop: string; story: string }> }) {
  const { shop: slug, story: raw } = await params;
  const { actor, shop } = await shopPageAccess(slug, "portfolio:curate", `/shop/${slug}/portfolio/${raw}`);
  if (!/^[1-9]\d{0,15}$/.test(raw)) notFound();
  const story = await getStory({ shopId: shop.id, storyId: Number(raw) });
  if (!story) notFound();
  const [items, choices, consents] = await Promise.all([listItems({ shopId: shop.id, storyId: story.id }), curationChoices(story), listConsents({ shopId: shop.id, storyId: story.id })]);
  return (
    <div className="space-y-6">
      <PageHeader
        title={story.title}
        description={`${formatJobNumber(story.jobNumber)} · ${describeMachine(story.machine)}`}
        back={{ href: `/shop/${shop.slug}/portfolio`, label: "Portfolio" }}
      />
      <PublishPanel shopSlug={shop.slug} story={story} consents={consents} mayPublish={can(actor, "portfolio:publish", { shopId: shop.id })} timeZone={shop.timezone} />
      {choices.entries.some((e) => e.kind === "torque") ? (
        <Caution title="Torque values in public">A torque record shows this machine&apos;s values as recorded. The public page says it is a record of this job, not instructions.</Caution>
      ) : null}
      <CurationForm
        shopSlug={shop.slug}
        timeZone={shop.timezone}
        story={{ id: story.id, version: story.version, title: story.title, slug: story.slug, writeUp: story.writeUp, cover: story.coverPhotoId }}
        items={items}
        entries={choices.entries}
        checklist={choices.checklist}
      />
    </div>
  );
}
