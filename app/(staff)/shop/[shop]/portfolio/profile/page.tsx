import type { Metadata } from "next";
import { ExternalLink } from "lucide-react";
import { getPublicShop } from "@/db/queries/portfolio-public";
import { ButtonLink, Card, PageHeader } from "@/components/ui";
import { shopLogoPath } from "@/lib/portfolio";
import { shopPageAccess } from "../../shop-access";
import { ProfileForm } from "../_components/profile-form";

export const metadata: Metadata = { title: "Shop profile" };

/** The shop owner's editor for the public page's header: name, about, location, contact, logo. */
export default async function ShopProfilePage({ params }: { params: Promise<{ shop: string }> }) {
  const { shop: slug } = await params;
  const { shop } = await shopPageAccess(slug, "shop:manage-settings", `/shop/${slug}/portfolio/profile`);
  const profile = (await getPublicShop({ shopId: shop.id }))!;
  return (
    <div className="space-y-4">
      <PageHeader
        title="Shop profile"
        description="What anyone sees at the top of the shop's public page. Only what you fill in is shown."
        back={{ href: `/shop/${shop.slug}/portfolio`, label: "Portfolio" }}
        actions={
          <ButtonLink href={`/s/${shop.slug}`} variant="secondary" icon={<ExternalLink aria-hidden className="size-5" />}>
            Public page
          </ButtonLink>
        }
      />
      <Card>
        <ProfileForm shopSlug={shop.slug} profile={profile} logoUrl={profile.logoKey ? `${shopLogoPath(shop.slug)}?v=${encodeURIComponent(profile.logoKey.slice(-12))}` : null} />
      </Card>
    </div>
  );
}
