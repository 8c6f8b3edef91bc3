import type { ReactNode } from "react";
import { AppHeader } from "@/components/app-header";
import { shopPageAccess } from "./shop-access";

export default async function ShopLayout({ children, params }: { children: ReactNode; params: Promise<{ shop: string }> }) {
  const { shop: slug } = await params;
  const { actor, shop } = await shopPageAccess(slug, "shop:view-board", `/shop/${slug}`);
  return (
    <>
      <AppHeader actor={actor} context={shop.name} />
      <main id="main" tabIndex={-1} className="mx-auto max-w-6xl px-4 py-6">
        {children}
      </main>
    </>
  );
}
