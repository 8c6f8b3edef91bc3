import type { Metadata } from "next";
import { Settings } from "lucide-react";
import { Alert, ButtonLink, PageHeader } from "@/components/ui";
import { searchParamsObject } from "@/lib/route";
import { inboxQuerySchema } from "@/lib/schemas/inbox";
import { safeTimeZone } from "@/lib/server/inbox";
import { inboxPageFor } from "@/lib/server/inbox-view";
import { shopPageAccess } from "../shop-access";
import { InboxView } from "./_components/inbox-view";

export const metadata: Metadata = { title: "Inbox" };

type Props = { params: Promise<{ shop: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> };

/** The desk inbox: what came in for the shop, newest first, read per person. */
export default async function InboxPage({ params, searchParams }: Props) {
  const { shop: slug } = await params;
  const found = await shopPageAccess(slug, "shop:view-board", `/shop/${slug}/inbox`);
  const raw = new URLSearchParams();
  for (const [k, v] of Object.entries(await searchParams)) for (const one of [v ?? []].flat()) raw.append(k, one);
  const parsed = inboxQuerySchema.safeParse(searchParamsObject(raw));
  const query = parsed.success ? parsed.data : inboxQuerySchema.parse({});
  const page = await inboxPageFor(found.actor, found, query);
  return (
    <div className="space-y-4">
      <PageHeader
        title="Inbox"
        description="What came in for the desk: owners' answers, payments, portfolio consent, new followers, mail that couldn't be delivered, parts in."
        actions={
          <ButtonLink href={`/shop/${found.shop.slug}/inbox/settings`} variant="secondary" icon={<Settings aria-hidden className="size-5" />}>
            E-mail settings
          </ButtonLink>
        }
      />
      {parsed.success ? null : <Alert tone="warning">Some filters in the address were not understood and were reset.</Alert>}
      <InboxView shopSlug={found.shop.slug} timeZone={safeTimeZone(found.shop.timezone)} query={query} initial={page} />
    </div>
  );
}
