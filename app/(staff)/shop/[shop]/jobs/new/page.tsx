import type { Metadata } from "next";
import { listShopStaff } from "@/db/queries/shops";
import { PageHeader } from "@/components/ui";
import { shopToday } from "@/lib/jobs-view";
import { shopPageAccess } from "../../shop-access";
import { CheckInForm } from "./_components/check-in-form";

export const metadata: Metadata = { title: "Check in a machine" };

type Props = { params: Promise<{ shop: string }> };

// No loading.tsx here: the access check below must answer (403) before anything streams.
export default async function CheckInPage({ params }: Props) {
  const { shop: slug } = await params;
  const { actor, shop, role } = await shopPageAccess(slug, "job:check-in", `/shop/${slug}/jobs/new`);
  const staff = await listShopStaff({ shopId: shop.id });
  return (
    <div className="mx-auto max-w-xl">
      <PageHeader
        title="Check in a machine"
        description="Who owns it, what it is, and what they say is wrong. Intake photos come next."
        back={{ href: `/shop/${shop.slug}`, label: "All jobs" }}
      />
      <CheckInForm
        shopSlug={shop.slug}
        today={shopToday(shop.timezone)}
        staff={staff}
        // A technician checking a machine in usually works on it too.
        defaultTechnicianId={role === "technician" ? actor.userId : null}
      />
    </div>
  );
}
