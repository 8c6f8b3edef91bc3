import clsx from "clsx";
import { Mail, MapPin, Phone } from "lucide-react";
import type { PublicShop } from "@/lib/portfolio";

const link = "inline-flex min-h-tap items-center gap-2 font-semibold text-oil underline underline-offset-2";

/** Where the shop is (as it chose to say) and how to reach it; nothing when it gave none. */
export function ShopContactList({ shop, label, className }: { shop: Pick<PublicShop, "location" | "phone" | "email">; label: string; className?: string }) {
  if (!shop.location && !shop.phone && !shop.email) return null;
  return (
    <ul className={clsx("flex flex-wrap gap-x-5 gap-y-2 text-ink", className)} aria-label={label}>
      {shop.location ? (
        <li className="flex min-h-tap items-center gap-2">
          <MapPin aria-hidden className="size-5 shrink-0 text-ink-muted" />
          {shop.location}
        </li>
      ) : null}
      {shop.phone ? (
        <li>
          <a href={`tel:${shop.phone.replace(/[^+\d]/g, "")}`} className={link}>
            <Phone aria-hidden className="size-5 shrink-0" />
            {shop.phone}
          </a>
        </li>
      ) : null}
      {shop.email ? (
        <li>
          <a href={`mailto:${shop.email}`} className={clsx(link, "break-all")}>
            <Mail aria-hidden className="size-5 shrink-0" />
            {shop.email}
          </a>
        </li>
      ) : null}
    </ul>
  );
}
