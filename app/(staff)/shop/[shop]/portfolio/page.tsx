import type { Metadata } from "next";
import Link from "next/link";
import { ExternalLink, Images } from "lucide-react";
import { listStories } from "@/db/queries/portfolio";
import { ButtonLink, EmptyState, PageHeader, TBody, TD, TH, THead, TR, Table } from "@/components/ui";
import { describeMachine } from "@/lib/machine";
import { can } from "@/lib/permissions";
import { formatJobNumber } from "@/lib/schemas/jobs";
import { shopPageAccess } from "../shop-access";
import { StoryStatusBadge } from "./_components/story-status";

export const metadata: Metadata = { title: "Portfolio" };

/** The shop's stories in every state: proposed, waiting on the owner, public, taken down. */
export default async function PortfolioPage({ params }: { params: Promise<{ shop: string }> }) {
  const { shop: slug } = await params;
  const { actor, shop } = await shopPageAccess(slug, "portfolio:curate", `/shop/${slug}/portfolio`);
  const stories = await listStories({ shopId: shop.id });
  const when = new Intl.DateTimeFormat("en-US", { timeZone: shop.timezone, month: "short", day: "numeric", year: "numeric" });
  return (
    <div className="space-y-4">
      <PageHeader
        title="Portfolio"
        description="Finished jobs shown on the shop's public page. A story goes public only when the machine's owner agrees and the shop owner publishes it."
        actions={
          <>
            <ButtonLink href={`/s/${shop.slug}`} variant="secondary" icon={<ExternalLink aria-hidden className="size-5" />}>
              Public page
            </ButtonLink>
            {can(actor, "shop:manage-settings", { shopId: shop.id }) ? <ButtonLink href={`/shop/${shop.slug}/portfolio/profile`}>Edit the shop&apos;s profile</ButtonLink> : null}
          </>
        }
      />
      {stories.length === 0 ? (
        <EmptyState
          icon={Images}
          title="No stories yet"
          description="Open a collected job and choose “Propose for the portfolio”: the owner is asked by e-mail, then you pick what to show."
        />
      ) : (
        <Table label="Stories">
          <THead>
            <TR>
              <TH>Story</TH>
              <TH>Job</TH>
              <TH>Status</TH>
              <TH>Last change</TH>
            </TR>
          </THead>
          <TBody>
            {stories.map((s) => (
              <TR key={s.id}>
                <TD>
                  <Link href={`/shop/${shop.slug}/portfolio/${s.id}`} className="inline-flex min-h-tap items-center font-semibold text-oil underline underline-offset-2">
                    {s.title}
                  </Link>
                </TD>
                <TD>
                  {formatJobNumber(s.jobNumber)} · {describeMachine(s.machine)}
                </TD>
                <TD>
                  <StoryStatusBadge status={s.status} />
                </TD>
                <TD className="whitespace-nowrap">{when.format(s.updatedAt)}</TD>
              </TR>
            ))}
          </TBody>
        </Table>
      )}
    </div>
  );
}
