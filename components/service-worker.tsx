"use client";
import { usePathname } from "next/navigation";
import { useEffect, useRef, useState } from "react";
import { SW_SCOPE, SW_URL, isOfflinePath } from "@/lib/offline/cache-rules";
import { claimOfflineCopies } from "@/lib/offline/private-caches";

/**
 * Registers the staff app's service worker (lib/offline/sw.ts), from the shop layout only: staff
 * pages, scope /shop/. Production builds only (`next dev` has no built worker, and drops one left
 * over). A job or bench page the worker didn't see arrive (the page it first started on; pages
 * reached by the app's own links, which fetch only the page's data) is handed to it to keep, so it
 * opens offline next time.
 */
export function StaffServiceWorker({ userId }: { userId: number }) {
  const pathname = usePathname();
  const [worker, setWorker] = useState<ServiceWorker | null>(null);
  // A page loaded while the worker was in charge was kept on its way in: no second fetch for it.
  const arrivedThroughWorker = useRef<string | null>(null);

  useEffect(() => {
    if (!("serviceWorker" in navigator)) return;
    if (process.env.NODE_ENV !== "production") {
      // `next dev` names its files without content hashes: a worker left by a production build on
      // this address would serve stale scripts, so none runs here.
      void navigator.serviceWorker.getRegistrations().then((all) => all.forEach((r) => void r.unregister()));
      return;
    }
    if (navigator.serviceWorker.controller) arrivedThroughWorker.current = location.pathname;
    let stopped = false;
    const start = async () => {
      await claimOfflineCopies(String(userId));
      await navigator.serviceWorker.register(SW_URL, { scope: SW_SCOPE });
      const ready = await navigator.serviceWorker.ready;
      if (!stopped) setWorker(ready.active);
    };
    // No worker (an old browser, storage switched off): the app works online as before.
    const go = () => void start().catch(() => undefined);
    // After the page has loaded: the worker's first install fetches the build's files.
    if (document.readyState === "complete") go();
    else window.addEventListener("load", go, { once: true });
    return () => {
      stopped = true;
      window.removeEventListener("load", go);
    };
  }, [userId]);

  useEffect(() => {
    if (!worker || !isOfflinePath(pathname)) return;
    if (arrivedThroughWorker.current === pathname) {
      arrivedThroughWorker.current = null;
      return;
    }
    worker.postMessage({ type: "CACHE_URLS", payload: { urlsToCache: [location.origin + pathname] } });
  }, [worker, pathname]);

  return null;
}
