"use client";
import { useRouter } from "next/navigation";
import { useEffect } from "react";

/** Re-reads the page every few seconds while the owner may be answering, so their answer shows up by itself. */
export function AutoRefresh({ everyMs = 5_000 }: { everyMs?: number }) {
  const router = useRouter();
  useEffect(() => {
    const timer = window.setInterval(() => {
      if (document.visibilityState === "visible") router.refresh();
    }, everyMs);
    return () => window.clearInterval(timer);
  }, [router, everyMs]);
  return null;
}
