import type { Metadata } from "next";
import { PageHeader } from "@/components/ui";
import { inboxSettingsFor } from "@/lib/server/inbox-view";
import { shopPageAccess } from "../../shop-access";
import { SettingsForm } from "./settings-form";

export const metadata: Metadata = { title: "Inbox e-mail settings" };

/** Each staff member's own choice, per kind of inbox item: e-mail at once, in the morning e-mail, or none. */
export default async function InboxSettingsPage({ params }: { params: Promise<{ shop: string }> }) {
  const { shop: slug } = await params;
  const found = await shopPageAccess(slug, "shop:view-board", `/shop/${slug}/inbox/settings`);
  const { deliveries, mayViewMoney } = await inboxSettingsFor(found.actor, found);
  return (
    <div className="space-y-4">
      <PageHeader
        title="Inbox e-mail settings"
        description="Everything lands in the inbox either way. Choose, for each kind, whether it also comes to you by e-mail at once, in one e-mail each morning, or not at all. These are your own settings; your colleagues choose theirs."
        back={{ href: `/shop/${found.shop.slug}/inbox`, label: "Inbox" }}
      />
      <SettingsForm shopSlug={found.shop.slug} deliveries={deliveries} mayViewMoney={mayViewMoney} />
    </div>
  );
}
