// The staff app's service worker (issue 20 §1), built by scripts/build-sw.mjs after each
// `next build` (esbuild bundles this file, Serwist's injectManifest fills in the build's files)
// and registered by components/service-worker.tsx on staff pages only, scoped to /shop/.
//   - Build files (/_next/static/…) are precached, so a page opened once runs its scripts offline;
//     anything not in the list is cache-first in a cache of its own.
//   - Staff job and bench pages: network first, the copy from the last visit when the network is
//     gone or hangs (garage Wi-Fi), never a redirect or an error page.
//   - Journal photos those pages show: kept beside them. No other API answer, nothing of sign-in
//     and no POST is ever cached (lib/offline/cache-rules.ts). Pages and photos are one person's:
//     the window empties those caches at sign-out, and this worker does too when the server sends
//     a page request to sign-in.
import { CacheFirst, CacheableResponsePlugin, ExpirationPlugin, NetworkFirst, type PrecacheEntry, Serwist, type SerwistPlugin, StaleWhileRevalidate } from "serwist";
import { PAGES_CACHE, PHOTOS_CACHE, PRIVATE_CACHES, STATIC_CACHE, endedSession, isCachedPhoto, isOfflinePage, isStaticAsset, keepable } from "./cache-rules";

// Typed here rather than with TypeScript's "webworker" library, which clashes with "dom" in the app's program.
declare const self: { __SW_MANIFEST: (PrecacheEntry | string)[] | undefined; location: { origin: string } };

const DAY = 24 * 60 * 60;
const origin = self.location.origin;

const forgetWhenSignedOut: SerwistPlugin = {
  // Navigations fetch with redirect "manual", so a redirect comes back opaque: for these pages
  // only the session gate redirects (to sign-in), and emptying the caches is the safe side anyway.
  fetchDidSucceed: async ({ response }) => {
    if (response.type === "opaqueredirect" || endedSession(response)) await Promise.all(PRIVATE_CACHES.map((name) => caches.delete(name)));
    return response;
  },
};

const wholePagesOnly: SerwistPlugin = {
  cacheWillUpdate: async ({ response }) => (keepable(response) ? response : null),
};

const serwist = new Serwist({
  precacheEntries: self.__SW_MANIFEST,
  precacheOptions: { cleanupOutdatedCaches: true, concurrency: 4 },
  skipWaiting: true,
  clientsClaim: true,
  runtimeCaching: [
    {
      matcher: ({ request }) => isOfflinePage(request, origin),
      handler: new NetworkFirst({
        cacheName: PAGES_CACHE,
        // A network that answers nothing for this long is treated as gone (garage Wi-Fi that is
        // joined but passes nothing): the last copy shows. Long enough for a slow page on a busy server.
        networkTimeoutSeconds: 10,
        // The kept copy was asked for without Next's router headers, as a navigation is.
        matchOptions: { ignoreVary: true },
        plugins: [forgetWhenSignedOut, wholePagesOnly, new ExpirationPlugin({ maxEntries: 60, maxAgeSeconds: 14 * DAY })],
      }),
    },
    {
      matcher: ({ request }) => isStaticAsset(request, origin),
      handler: new CacheFirst({
        cacheName: STATIC_CACHE,
        plugins: [new CacheableResponsePlugin({ statuses: [200] }), new ExpirationPlugin({ maxEntries: 300, maxAgeSeconds: 60 * DAY })],
      }),
    },
    {
      matcher: ({ request }) => isCachedPhoto(request, origin),
      handler: new StaleWhileRevalidate({
        cacheName: PHOTOS_CACHE,
        plugins: [new CacheableResponsePlugin({ statuses: [200] }), new ExpirationPlugin({ maxEntries: 300, maxAgeSeconds: 14 * DAY })],
      }),
    },
  ],
});

serwist.addEventListeners();
