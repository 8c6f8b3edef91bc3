import { House, Lock } from "lucide-react";
import { AppStyles } from "@/app/app-styles";
import { buttonClasses } from "@/components/ui/button-classes";

// Shown when forbidden() is called: signed in, but this job, shop or page belongs to someone else.
// Server-only on purpose — Next ships this file with every route.
export default function Forbidden() {
  return (
    <main id="main" tabIndex={-1} className="mx-auto flex min-h-dvh max-w-md flex-col items-center justify-center gap-4 px-4 py-12 text-center">
      <AppStyles />
      <span className="flex size-16 items-center justify-center rounded-full bg-brass-soft text-brass">
        <Lock aria-hidden className="size-8" />
      </span>
      <h1 className="text-2xl font-extrabold tracking-tight">This one isn&apos;t yours to open</h1>
      <p className="text-ink-muted">
        You&apos;re signed in, but this page belongs to a different shop or customer. If you think you
        should see it, ask the shop to share it with you.
      </p>
      {/* A plain link in the button look: next/link would add its client code to every page, which ships this screen. */}
      {/* eslint-disable-next-line @next/next/no-html-link-for-pages -- see above */}
      <a href="/" className={buttonClasses("primary", "lg")}>
        <House aria-hidden className="size-5" />
        Back to the start
      </a>
    </main>
  );
}
