import localFont from "next/font/local";
import "./globals.css";

// The app's stylesheet and font, for every area but the shops' public pages, which carry their
// styles inside the page (app/(public)/layout.tsx, scripts/lib/public-css.mjs). So the root layout
// links no stylesheet, and each area's layout (and each root-level screen: not found, error,
// forbidden, the start page) renders <AppStyles /> once; Next links the file and browsers cache it.

// Self-hosted variable font: no request to a font CDN, one file covers every weight.
const archivo = localFont({
  src: [
    { path: "../public/fonts/archivo-wght.woff2", weight: "100 900", style: "normal" },
    { path: "../public/fonts/archivo-wght-italic.woff2", weight: "100 900", style: "italic" },
  ],
  variable: "--font-archivo",
  display: "swap",
  // Not preloaded: the stylesheet asks for the faces a page uses when it is first drawn, so a page
  // with no italics never downloads the italic file (bandwidth a slow phone needs for photos), and
  // text shows in the fallback face meanwhile (display: swap).
  preload: false,
});

/**
 * Sets the font's variable on the whole document (tailwind.config.ts `font-sans` reads it), dialogs
 * and other content placed straight into <body> included; React puts the rule in <head>.
 */
export function AppStyles() {
  return (
    <style href="benchside-app-font" precedence="default">
      {`:root{--font-archivo:${archivo.style.fontFamily}}`}
    </style>
  );
}
