"use client";

import { useEffect, useState } from "react";
import { Hourglass, House, RotateCcw, TriangleExclamationPoint } from "lucide-react";
import { buttonClasses } from "@/components/ui/button-classes";
import { DATABASE_UNAVAILABLE_MESSAGE } from "@/lib/errors";

const PROBE_EVERY_MS = 3000;

/**
 * Is the shop's database what failed? In production an error boundary gets no cause from the
 * server (only a digest), so ask the health endpoint, which names what is down, and keep asking
 * while it is down; `onBack` runs when it answers again. null until the first answer.
 */
function useDatabaseDown(onBack: () => void): boolean | null {
  const [down, setDown] = useState<boolean | null>(null);
  useEffect(() => {
    let timer: ReturnType<typeof setTimeout> | undefined;
    let stopped = false;
    let sawDown = false;
    const probe = async () => {
      let dbDown = false;
      try {
        const res = await fetch("/api/health", { cache: "no-store", signal: AbortSignal.timeout(5000) });
        const body = (await res.json().catch(() => ({}))) as { down?: unknown };
        dbDown = Array.isArray(body.down) && body.down.includes("db");
      } catch {
        // The app itself didn't answer: not something this page can name.
      }
      if (stopped) return;
      setDown(dbDown);
      if (dbDown) {
        sawDown = true;
        timer = setTimeout(probe, PROBE_EVERY_MS);
      } else if (sawDown) {
        onBack();
      }
    };
    void probe();
    return () => {
      stopped = true;
      clearTimeout(timer);
    };
  }, [onBack]);
  return down;
}

/** The page shown when a screen fails to load: plain words, and the database named when it is the cause. */
export function ErrorScreen({ error, retry }: { error: unknown; retry: () => void }) {
  // The records are back: load the screen again by ourselves.
  const down = useDatabaseDown(retry);

  useEffect(() => {
    // Keeps the cause in the browser console for support; the page itself stays plain.
    console.error(error);
  }, [error]);

  // Server errors carry a digest that matches the server log — worth showing for a support call.
  const digest = typeof error === "object" && error !== null && "digest" in error && typeof error.digest === "string" ? error.digest : undefined;

  return (
    <main id="main" tabIndex={-1} className="mx-auto flex min-h-dvh max-w-md flex-col items-center justify-center gap-4 px-4 py-12 text-center">
      <span className="flex size-16 items-center justify-center rounded-full bg-rust-soft text-rust">
        {down ? <Hourglass aria-hidden className="size-8" /> : <TriangleExclamationPoint aria-hidden className="size-8" />}
      </span>
      <div role="status" className="flex flex-col gap-4">
        {down ? (
          <>
            <h1 className="text-2xl font-extrabold tracking-tight">Briefly unavailable</h1>
            <p className="text-ink-muted">
              {DATABASE_UNAVAILABLE_MESSAGE} Nothing you saved before this is lost; this page reloads by itself when the records are back.
            </p>
          </>
        ) : (
          <>
            <h1 className="text-2xl font-extrabold tracking-tight">Something went wrong</h1>
            <p className="text-ink-muted">
              That didn&apos;t load. Nothing you saved before this is lost. Try again, and if it keeps happening, let the shop know.
            </p>
          </>
        )}
      </div>
      {digest ? <p className="text-sm text-ink-muted">Reference: {digest}</p> : null}
      <div className="flex w-full flex-col gap-2 sm:w-auto sm:flex-row">
        {/* Plain elements in the button look: Button's module brings next/link, and this screen ships with every page. A full load of the start page is the surer way back after an error. */}
        <button type="button" className={buttonClasses("primary", "lg")} onClick={() => retry()}>
          <RotateCcw aria-hidden className="size-5" />
          Try again
        </button>
        {/* eslint-disable-next-line @next/next/no-html-link-for-pages -- see above */}
        <a href="/" className={buttonClasses("secondary", "lg")}>
          <House aria-hidden className="size-5" />
          Back to the start
        </a>
      </div>
    </main>
  );
}
