import { MapPin, Phone } from "lucide-react";
import { OpeningHours } from "@/components/portfolio/opening-hours";
import { Card } from "@/components/ui";
import { getShopRowSettings } from "@/db/queries/shop-settings";
import { telHref } from "@/lib/shop-contact";

/** How to reach the shop: its phone (tap to call), address and hours, from the shop's settings. */
export async function ShopContactCard({ shopId }: { shopId: number }) {
  const shop = await getShopRowSettings({ shopId });
  const tel = telHref(shop.phone);
  if (!shop.phone && !shop.address && !shop.openingHours) return null;
  return (
    <Card as="section" title={`Reach ${shop.name}`} headingId="shop-contact">
      <div className="space-y-4">
        {shop.phone ? (
          <p className="flex items-center gap-2">
            <Phone aria-hidden className="size-5 shrink-0 text-oil" />
            {tel ? (
              <a href={tel} className="inline-flex min-h-tap items-center font-semibold text-oil underline underline-offset-2 hover:no-underline" data-testid="shop-phone">
                Call {shop.phone}
              </a>
            ) : (
              <span data-testid="shop-phone">{shop.phone}</span>
            )}
          </p>
        ) : null}
        {shop.address ? (
          <p className="flex items-start gap-2">
            <MapPin aria-hidden className="mt-0.5 size-5 shrink-0 text-oil" />
            <span className="whitespace-pre-line" data-testid="shop-address">
              {shop.address}
            </span>
          </p>
        ) : null}
        <OpeningHours hours={shop.openingHours} timezone={shop.timezone} />
      </div>
    </Card>
  );
}
