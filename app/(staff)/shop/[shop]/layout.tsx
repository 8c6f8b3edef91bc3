import type { ReactNode } from "react";
import { AppHeader } from "@/components/app-header";
import { ShopNav } from "@/components/shop-nav";
import { can } from "@/lib/permissions";
import { shopPageAccess } from "./shop-access";

export default async function ShopLayout({ children, params }: { children: ReactNode; params: Promise<{ shop: string }> }) {
  const { shop: slug } = await params;
  const { actor, shop } = await shopPageAccess(slug, "shop:view-board", `/shop/${slug}`);
  const here = { shopId: shop.id };
  const base = `/shop/${shop.slug}`;
  const links = [
    { href: base, label: "Jobs" },
    ...(can(actor, "job:check-in", here) ? [{ href: `${base}/jobs/new`, label: "Check in" }] : []),
    { href: `${base}/specs`, label: "Shop specs" },
    ...(can(actor, "portfolio:curate", here) ? [{ href: `${base}/portfolio`, label: "Portfolio" }] : []),
    ...(can(actor, "outbox:manage", here) ? [{ href: `${base}/outbox`, label: "Outgoing mail" }] : []),
  ];
  return (
    <>
      <AppHeader actor={actor} context={shop.name} />
      <ShopNav links={links} />
      <main id="main" tabIndex={-1} className="mx-auto max-w-6xl px-4 py-6">
        {children}
      </main>
    </>
  );
}
