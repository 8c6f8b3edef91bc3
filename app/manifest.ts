import type { MetadataRoute } from "next";

// The installable staff app (issue 20 §1), served at /manifest.webmanifest and linked from every
// page by Next. It opens on the shop's job board (/shop picks the shop); the service worker that
// keeps job and bench pages for offline use is registered from staff pages only
// (components/service-worker.tsx). Colours are the palette's (app/globals.css): paper behind the
// splash and the browser bar (as the viewport's light theme colour), the icon on oil.
export default function manifest(): MetadataRoute.Manifest {
  return {
    id: "/shop",
    name: "Benchside",
    short_name: "Benchside",
    description: "Your shop's jobs at the bench: journal, photos, clips, torque and readings, also with a weak signal.",
    start_url: "/shop",
    scope: "/",
    display: "standalone",
    orientation: "portrait",
    background_color: "#F5F2EC",
    theme_color: "#F5F2EC",
    categories: ["business", "productivity"],
    icons: [
      { src: "/icon.svg", sizes: "any", type: "image/svg+xml", purpose: "any" },
      { src: "/icon-192.png", sizes: "192x192", type: "image/png", purpose: "any" },
      { src: "/icon-512.png", sizes: "512x512", type: "image/png", purpose: "any" },
      { src: "/icon-maskable-512.png", sizes: "512x512", type: "image/png", purpose: "maskable" },
    ],
  };
}
