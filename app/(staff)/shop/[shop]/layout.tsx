import type { ReactNode } from "react";
import { AppHeader } from "@/components/app-header";
import { InboxBadge } from "@/components/inbox-badge";
import { ShopNav } from "@/components/shop-nav";
import { LiveShopUpdates } from "@/components/live-updates";
import { StaffServiceWorker } from "@/components/service-worker";
import { OutboxRunner } from "@/components/outbox-runner";
import { latestEventId } from "@/db/queries/shop-events";
import { can } from "@/lib/permissions";
import { unreadCountFor } from "@/lib/server/inbox-view";
import { shopPageAccess } from "./shop-access";

export default async function ShopLayout({ children, params }: { children: ReactNode; params: Promise<{ shop: string }> }) {
  const { shop: slug } = await params;
  const found = await shopPageAccess(slug, "shop:view-board", `/shop/${slug}`);
  const { actor, shop } = found;
  // Every staff page of the shop listens to the shop's live stream, once (components/live-updates.tsx).
  const [unread, since] = await Promise.all([unreadCountFor(actor, found), latestEventId()]);
  const here = { shopId: shop.id };
  const base = `/shop/${shop.slug}`;
  const links = [
    { href: base, label: "Jobs" },
    { href: `${base}/inbox`, label: "Inbox", badge: <InboxBadge shopSlug={shop.slug} initial={unread} /> },
    ...(can(actor, "job:check-in", here) ? [{ href: `${base}/jobs/new`, label: "Check in" }] : []),
    ...(can(actor, "customer:view", here) ? [{ href: `${base}/customers`, label: "Customers" }] : []),
    ...(can(actor, "parts:manage", here) ? [{ href: `${base}/parts`, label: "Parts on order" }] : []),
    { href: `${base}/specs`, label: "Shop specs" },
    ...(can(actor, "portfolio:curate", here) ? [{ href: `${base}/portfolio`, label: "Portfolio" }] : []),
    ...(can(actor, "outbox:manage", here) ? [{ href: `${base}/outbox`, label: "Outgoing mail" }] : []),
    ...(can(actor, "shop:manage-settings", here) ? [{ href: `${base}/settings`, label: "Settings" }] : []),
    ...(can(actor, "shop:manage-staff", here) ? [{ href: `${base}/staff`, label: "Staff" }] : []),
    { href: `${base}/account`, label: "Your account" },
  ];
  return (
    <LiveShopUpdates shopSlug={shop.slug} since={since}>
      {/* The installable staff app's offline worker: staff pages only (issue 20 §1). */}
      <StaffServiceWorker userId={actor.userId} />
      {/* The phone's outbox goes from every staff page, as this person's posts only (issue 20 §2). */}
      <OutboxRunner userId={actor.userId} />
      <AppHeader actor={actor} context={shop.name} />
      <ShopNav links={links} />
      <main id="main" tabIndex={-1} className="mx-auto max-w-6xl px-4 py-6">
        {children}
      </main>
    </LiveShopUpdates>
  );
}
