import { buildServiceWorker, workerFileName } from "./scripts/build-sw.mjs";
import { buildPublicCss } from "./scripts/lib/public-css.mjs";

const distDir = process.env.NEXT_DIST_DIR || ".next";

/** @type {import('next').NextConfig} */
const nextConfig = {
  // Tests build into their own folder so `npm test` never disturbs a running `npm start`.
  distDir,
  // Each build checks types against its own generated route types only (see tsconfig.test-build.json).
  // The bench's build (.next-bench) and the cluster's (.next-cluster) skip it: they measure and run; types are `npm run lint`'s.
  typescript: {
    tsconfigPath: process.env.NEXT_DIST_DIR === ".next-test" ? "tsconfig.test-build.json" : "tsconfig.json",
    ignoreBuildErrors: process.env.NEXT_DIST_DIR === ".next-bench" || process.env.NEXT_DIST_DIR === ".next-cluster",
  },
  poweredByHeader: false,
  // The staff app's service worker (issue 20 §1): made for this build once the bundler has written
  // its files (scripts/build-sw.mjs), into public/sw/<build folder>.js, and served at /sw.js.
  compiler: {
    // …and the public pages' inline stylesheet (scripts/lib/public-css.mjs), into the build folder.
    runAfterProductionCompile: async ({ projectDir, distDir: builtInto }) => {
      await Promise.all([buildServiceWorker({ projectDir, distDir: builtInto }), buildPublicCss({ projectDir, distDir: builtInto })]);
    },
  },
  async rewrites() {
    return [{ source: "/sw.js", destination: `/sw/${workerFileName(distDir)}` }];
  },
  experimental: {
    authInterrupts: true,
    // A form with the shop's logo (5 MB at most) is the largest action body; lib/action-guard.ts
    // answers 413 above this in the proxy, before Next would answer a bare 500.
    serverActions: { bodySizeLimit: "6mb" },
  },
  // email-reply-parser tries `require("re2")` (an optional native peer we don't install) and falls
  // back to RegExp: left to Node at run time so the bundler doesn't try to resolve it.
  serverExternalPackages: ["knex", "mysql2", "bcryptjs", "email-reply-parser"],
  // The same on every answer, JSON, files and the routes proxy.ts leaves alone included. The
  // per-request ones (Content-Security-Policy with its nonce, Permissions-Policy, HSTS) are
  // set in proxy.ts from lib/security-headers.ts.
  async headers() {
    return [
      {
        source: "/:path*",
        headers: [
          { key: "X-Content-Type-Options", value: "nosniff" },
          { key: "X-Frame-Options", value: "DENY" },
          { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
        ],
      },
    ];
  },
};
export default nextConfig;
