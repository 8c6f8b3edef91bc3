import type { Metadata, Viewport } from "next";
import type { ReactNode } from "react";

export const metadata: Metadata = {
  title: { template: "%s · Benchside", default: "Benchside" },
  description:
    "Job journals for independent powersports and small-engine shops: bench notes, approvals and hand-back in one place.",
  applicationName: "Benchside",
};

export const viewport: Viewport = {
  width: "device-width",
  initialScale: 1,
  // Browser chrome matches the page background in each mode (see --paper in globals.css).
  themeColor: [
    { media: "(prefers-color-scheme: light)", color: "#F5F2EC" },
    { media: "(prefers-color-scheme: dark)", color: "#151412" },
  ],
  colorScheme: "light dark",
};

// Not rendered per request here: the shops' public pages (/s/…) are served from the cache (ISR,
// with a policy that needs no nonce). Every other area's layout calls connection(), so its pages
// are rendered per request and their scripts carry that request's CSP nonce (proxy.ts).
// No stylesheet here either: the public pages carry theirs inline, every other area links the
// app's (app/app-styles.tsx), so a story opened on a slow phone waits for no second request.
export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en">
      <body className="min-h-dvh">
        {/* Each area renders its own <main id="main">; this lets keyboard users jump past its header. */}
        <a
          href="#main"
          className="sr-only focus:not-sr-only focus:fixed focus:left-3 focus:top-3 focus:z-50 focus:inline-flex focus:min-h-tap focus:items-center focus:rounded-md focus:bg-oil focus:px-4 focus:font-semibold focus:text-oil-on"
        >
          Skip to content
        </a>
        {children}
      </body>
    </html>
  );
}
