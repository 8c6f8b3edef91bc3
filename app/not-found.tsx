import type { Metadata } from "next";
import { House, SearchX } from "lucide-react";
import { AppStyles } from "@/app/app-styles";
import { buttonClasses } from "@/components/ui/button-classes";

export const metadata: Metadata = { title: "Not found" };

export default function NotFound() {
  return (
    <main id="main" tabIndex={-1} className="mx-auto flex min-h-dvh max-w-md flex-col items-center justify-center gap-4 px-4 py-12 text-center">
      <AppStyles />
      <span className="flex size-16 items-center justify-center rounded-full bg-sunken text-ink-muted">
        <SearchX aria-hidden className="size-8" />
      </span>
      <h1 className="text-2xl font-extrabold tracking-tight">We can&apos;t find that page</h1>
      <p className="text-ink-muted">
        The link may be old, or the job may have been moved. Check the address, or head back to the start.
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
