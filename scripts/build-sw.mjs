// Builds the staff app's service worker (lib/offline/sw.ts) for one `next build`. next.config.mjs
// calls it from `compiler.runAfterProductionCompile`, so every build (npm start's .next, npm test's
// .next-test, the bench's…) makes its own, after the bundler wrote /_next/static and before Next
// prerenders. Serwist's configurator mode does the same with its CLI as a separate step; this is
// that step inside the build, with the same two tools: esbuild bundles the worker, and
// @serwist/build's injectManifest puts the list of the build's files into it.
//
// The worker goes to public/sw/<build folder>.js (git-ignored): each build folder keeps its own, so
// a test build never replaces the worker of a running `npm start`; next.config.mjs serves this
// build's file at /sw.js.
import { mkdir, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";

/** The worker's file name for a build folder: ".next" → "next.js", ".next-test" → "next-test.js". */
export function workerFileName(distDir) {
  const base = String(distDir).replace(/[\\/]+$/, "").split(/[\\/]/).pop() ?? "";
  const name = base.replace(/^\.+/, "").replace(/[^A-Za-z0-9_-]/g, "-");
  return `${name || "next"}.js`;
}

/** public/sw/<name>.js for the build in `distDir` (absolute, or relative to `projectDir`). */
export async function buildServiceWorker({ projectDir, distDir }) {
  const { build } = await import("esbuild");
  const { injectManifest } = await import("@serwist/build");
  const dist = path.resolve(projectDir, distDir);
  const swDest = path.join(projectDir, "public", "sw", workerFileName(dist));
  const bundled = path.join(os.tmpdir(), `benchside-sw-${process.pid}-${Date.now()}.js`);
  await mkdir(path.dirname(swDest), { recursive: true });
  try {
    await build({
      entryPoints: [path.join(projectDir, "lib", "offline", "sw.ts")],
      outfile: bundled,
      bundle: true,
      format: "iife",
      platform: "browser",
      target: ["chrome109", "safari16", "firefox115"],
      minify: true,
      legalComments: "none",
      // Serwist's logging is for development builds; a production worker stays quiet.
      define: { "process.env.NODE_ENV": JSON.stringify("production") },
      tsconfig: path.join(projectDir, "tsconfig.json"),
      logLevel: "warning",
    });
    const { count, size, warnings } = await injectManifest({
      swSrc: bundled,
      swDest,
      globDirectory: dist,
      // Scripts, styles and fonts: what a page needs to run once its HTML is there. Images the
      // pages use come from /api or the icons, which are small and cached when first asked for.
      globPatterns: ["static/**/*.{js,css,woff2}"],
      modifyURLPrefix: { "static/": "/_next/static/" },
      // The names already carry a content hash: no ?__WB_REVISION__ needed.
      dontCacheBustURLsMatching: /^\/_next\/static\//,
      maximumFileSizeToCacheInBytes: 4 * 1024 * 1024,
    });
    for (const warning of warnings) console.warn(`service worker: ${warning}`);
    console.log(`service worker: public/sw/${path.basename(swDest)}, ${count} build files precached (${Math.round(size / 1024)} KiB)`);
  } finally {
    await rm(bundled, { force: true });
  }
}
