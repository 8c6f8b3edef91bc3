import type { Metadata } from "next";
import { Card, PageHeader } from "@/components/ui";
import { ROLE_LABEL } from "@/lib/permissions";
import { shopPageAccess } from "../shop-access";
import { ChangePasswordForm } from "./password-form";

export const metadata: Metadata = { title: "Your account" };

/** The signed-in staff member's own account: who they are here, and their password. */
export default async function AccountPage({ params }: { params: Promise<{ shop: string }> }) {
  const { shop: slug } = await params;
  const { actor, shop, role } = await shopPageAccess(slug, "shop:view-board", `/shop/${slug}/account`);
  return (
    <div className="space-y-6">
      <PageHeader title="Your account" description={`${actor.name} · ${actor.email} · ${ROLE_LABEL[role]} at ${shop.name}`} back={{ href: `/shop/${shop.slug}`, label: "All jobs" }} />
      <Card as="section" title="Change your password" headingId="password-heading" description="Changing it signs you out on every other phone and computer; you stay signed in here.">
        <ChangePasswordForm />
      </Card>
    </div>
  );
}
