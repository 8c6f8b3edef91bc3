import type { Metadata } from "next";
import { Alert, ButtonLink } from "@/components/ui";
import { signupTokenSchema } from "@/lib/schemas/shop-signup";
import { viewShopSignup } from "@/lib/server/shop-signup";
import { ConfirmShopForm } from "./confirm-form";

export const metadata: Metadata = { title: "Confirm your shop" };

// Opening the link only shows this form: mail scanners that follow links must not create the shop.
export default async function ConfirmShopPage({ searchParams }: { searchParams: Promise<{ token?: string | string[] }> }) {
  const { token } = await searchParams;
  const parsed = signupTokenSchema.safeParse(token);
  const view = parsed.success ? await viewShopSignup({ token: parsed.data }) : null;
  return (
    <div className="mx-auto max-w-md space-y-4">
      <h1 className="text-2xl font-bold">Confirm your shop</h1>
      {view?.ok ? (
        <>
          <p className="text-ink-muted">
            Create <strong className="text-ink">{view.shopName}</strong> at <strong className="text-ink">/s/{view.slug}</strong> with{" "}
            <strong className="text-ink">{view.email}</strong> as its owner.
          </p>
          <ConfirmShopForm token={parsed.data!} email={view.email} existingAccount={view.existingAccount} />
        </>
      ) : (
        <Alert
          tone="error"
          action={
            <ButtonLink href={view?.message.includes("Sign in") ? "/sign-in" : "/start"} variant="secondary">
              {view?.message.includes("Sign in") ? "Sign in" : "Start again"}
            </ButtonLink>
          }
        >
          {view ? view.message : "This confirmation link is incomplete. Open it again from the e-mail."}
        </Alert>
      )}
    </div>
  );
}
