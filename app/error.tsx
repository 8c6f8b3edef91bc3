"use client";

import { useEffect } from "react";
import { House, RotateCcw, TriangleExclamationPoint } from "lucide-react";
import { Button, ButtonLink } from "@/components/ui/button";

export default function ErrorPage({ error, retry }: { error: unknown; retry: () => void }) {
  useEffect(() => {
    // Keeps the cause in the browser console for support; the page itself stays plain.
    console.error(error);
  }, [error]);

  // Server errors carry a digest that matches the server log — worth showing for a support call.
  const digest =
    typeof error === "object" && error !== null && "digest" in error && typeof error.digest === "string"
      ? error.digest
      : undefined;

  return (
    <main id="main" tabIndex={-1} className="mx-auto flex min-h-dvh max-w-md flex-col items-center justify-center gap-4 px-4 py-12 text-center">
      <span className="flex size-16 items-center justify-center rounded-full bg-rust-soft text-rust">
        <TriangleExclamationPoint aria-hidden className="size-8" />
      </span>
      <h1 className="text-2xl font-extrabold tracking-tight">Something went wrong</h1>
      <p className="text-ink-muted">
        That didn&apos;t load. Nothing you saved before this is lost. Try again, and if it keeps
        happening, let the shop know.
      </p>
      {digest ? <p className="text-sm text-ink-muted">Reference: {digest}</p> : null}
      <div className="flex w-full flex-col gap-2 sm:w-auto sm:flex-row">
        <Button size="lg" onClick={() => retry()} icon={<RotateCcw aria-hidden className="size-5" />}>
          Try again
        </Button>
        <ButtonLink href="/" size="lg" variant="secondary" icon={<House aria-hidden className="size-5" />}>
          Back to the start
        </ButtonLink>
      </div>
    </main>
  );
}
