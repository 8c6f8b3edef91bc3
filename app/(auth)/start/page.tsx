import type { Metadata } from "next";
import Link from "next/link";
import { SUPPORTED_CURRENCIES, timeZoneChoices } from "@/lib/shop-settings";
import { appUrl } from "@/lib/server/config";
import { StartShopForm } from "./_components/start-form";

export const metadata: Metadata = { title: "Start your shop" };

export default function StartShopPage() {
  return (
    <div className="mx-auto max-w-xl space-y-6">
      <div className="space-y-2">
        <h1 className="text-2xl font-bold">Start your shop</h1>
        <p className="text-ink-muted">
          Set up your shop on Benchside in a minute. We e-mail you a link to confirm the address; the shop is created when you open it, and you land on
          your job board.
        </p>
      </div>
      <StartShopForm zones={["UTC", ...timeZoneChoices().filter((z) => z !== "UTC")]} currencies={SUPPORTED_CURRENCIES} appOrigin={appUrl()} />
      <p className="text-sm text-ink-muted">
        Already working in a shop on Benchside?{" "}
        <Link href="/sign-in" className="inline-flex min-h-tap items-center font-semibold text-oil underline underline-offset-2 hover:no-underline">
          Sign in
        </Link>
      </p>
    </div>
  );
}
