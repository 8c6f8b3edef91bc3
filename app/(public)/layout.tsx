import type { Metadata } from "next";
import type { ReactNode } from "react";
import { Brand } from "@/components/brand";
import { appUrl } from "@/lib/server/config";
import { publicPagesCss } from "@/lib/server/public-css";

// The public area (shops' portfolios): no sign-in, no cookies of ours, no tracking. Each page
// renders its own <main>. Canonical addresses and social cards resolve against APP_URL.
export async function generateMetadata(): Promise<Metadata> {
  return { metadataBase: new URL(appUrl()) };
}

// Styles inside the page, not linked (scripts/lib/public-css.mjs says why); React puts the rule in
// <head>, so the first bytes to arrive can paint.
export default async function PublicLayout({ children }: { children: ReactNode }) {
  return (
    <div className="flex min-h-dvh flex-col">
      <style href="benchside-public" precedence="default">
        {await publicPagesCss()}
      </style>
      <div className="flex-1">{children}</div>
      <footer className="border-t border-line bg-surface">
        <div className="mx-auto flex max-w-5xl flex-wrap items-center gap-3 px-4 py-4 text-sm text-ink-muted">
          <Brand size="sm" />
          <p>Job stories from independent repair shops, published with each machine owner&apos;s consent.</p>
        </div>
      </footer>
    </div>
  );
}
