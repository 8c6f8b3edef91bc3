import type { Page } from "@playwright/test";

// The staff app's service worker (lib/offline/sw.ts) from a test's side. It starts after a staff
// page has loaded and fetches the build's files before it takes over, so a test that goes offline
// first waits for it, and for the page it wants to reopen to have been kept.

/** Waits until the worker runs this page's scope; its scope and script address. */
export async function workerReady(page: Page): Promise<{ scope: string; script: string }> {
  return page.evaluate(async () => {
    const reg = await navigator.serviceWorker.ready;
    return { scope: reg.scope, script: reg.active?.scriptURL ?? "" };
  });
}

/** Whether the worker keeps a copy of `url` among the pages it shows offline (the "benchside-pages" cache). */
export async function pageKept(page: Page, url: string): Promise<boolean> {
  // caches.match with a cache name reads without creating the cache (caches.open would).
  return page.evaluate(async (u) => !!(await caches.match(u, { cacheName: "benchside-pages", ignoreVary: true })), new URL(url, page.url()).href);
}
