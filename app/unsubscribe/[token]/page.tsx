import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { connection } from "next/server";
import { AppStyles } from "@/app/app-styles";
import { Brand } from "@/components/brand";
import { describeSubscription } from "@/db/queries/following";
import { describeMachine } from "@/lib/machine";
import { readUnsubscribeToken } from "@/lib/server/signed-token";
import { UnsubscribeForm } from "./unsubscribe-form";

export const metadata: Metadata = { title: "Stop e-mails about a job", robots: { index: false } };

/**
 * Where the visible "stop these e-mails" link lands. Opening it changes nothing (mail scanners
 * open links); the button does. No sign-in: the signed token in the address is the right to ask.
 */
export default async function UnsubscribePage({ params }: { params: Promise<{ token: string }> }) {
  // Rendered per request: the page's scripts carry this request's CSP nonce (proxy.ts).
  await connection();
  const { token } = await params;
  const subscriberId = readUnsubscribeToken(token);
  const sub = subscriberId == null ? null : await describeSubscription({ subscriberId });
  if (!sub) notFound();
  const machine = describeMachine(sub.machine);
  return (
    <div className="flex min-h-dvh flex-col">
      <AppStyles />
      <header className="px-4 py-3">
        <Brand />
      </header>
      <main id="main" tabIndex={-1} className="mx-auto w-full max-w-md flex-1 space-y-4 px-4 py-10">
        <h1 className="text-2xl font-extrabold tracking-tight">Stop e-mails about the {machine}?</h1>
        <p className="text-ink-muted">
          {sub.shopName} sends updates on this job to {sub.email}. You can start them again any time from the job page.
        </p>
        <UnsubscribeForm token={token} already={sub.unsubscribed} />
      </main>
    </div>
  );
}
