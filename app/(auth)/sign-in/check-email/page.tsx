import type { Metadata } from "next";
import { MailCheck } from "lucide-react";
import { ButtonLink } from "@/components/ui";
import { LINK_REQUEST_ANSWER } from "@/lib/server/sign-in";

export const metadata: Metadata = { title: "Check your e-mail" };

export default async function CheckEmailPage({ searchParams }: { searchParams: Promise<{ to?: string }> }) {
  const { to } = await searchParams;
  return (
    <div className="space-y-4 text-center">
      <MailCheck aria-hidden className="mx-auto size-12 text-oil" />
      <h1 className="text-2xl font-bold">Check your e-mail</h1>
      {/* The same answer for every address: it must not tell whether a shop knows it. */}
      <p className="text-ink-muted">{LINK_REQUEST_ANSWER}</p>
      {to ? (
        <p className="text-ink-muted">
          Address: <strong className="text-ink">{to}</strong>
        </p>
      ) : null}
      <p className="text-ink-muted">Nothing after a few minutes? Check the address and your spam folder, or ask for another link. Use the address you gave the shop.</p>
      <ButtonLink href="/sign-in" variant="secondary">
        Back to sign-in
      </ButtonLink>
    </div>
  );
}
