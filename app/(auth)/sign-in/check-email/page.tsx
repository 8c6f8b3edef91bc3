import type { Metadata } from "next";
import { MailCheck } from "lucide-react";
import { ButtonLink } from "@/components/ui";
import { LIMITS } from "@/lib/server/sign-in";

export const metadata: Metadata = { title: "Check your e-mail" };

export default async function CheckEmailPage({ searchParams }: { searchParams: Promise<{ to?: string }> }) {
  const { to } = await searchParams;
  return (
    <div className="space-y-4 text-center">
      <MailCheck aria-hidden className="mx-auto size-12 text-oil" />
      <h1 className="text-2xl font-bold">Check your e-mail</h1>
      <p className="text-ink-muted">
        We sent a sign-in link to <strong className="text-ink">{to ?? "your address"}</strong>. It works once and lasts {LIMITS.linkTtlMinutes} minutes.
      </p>
      <p className="text-ink-muted">Nothing after a few minutes? Check your spam folder, or ask for another link.</p>
      <ButtonLink href="/sign-in" variant="secondary">
        Back to sign-in
      </ButtonLink>
    </div>
  );
}
