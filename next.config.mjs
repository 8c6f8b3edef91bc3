/** @type {import('next').NextConfig} */
const nextConfig = {
  // Tests build into their own folder so `npm test` never disturbs a running `npm start`.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  // Each build checks types against its own generated route types only (see tsconfig.test-build.json).
  // The bench's build (.next-bench) skips it: `npm run bench` measures speed and size; types are `npm run lint`'s.
  typescript: {
    tsconfigPath: process.env.NEXT_DIST_DIR === ".next-test" ? "tsconfig.test-build.json" : "tsconfig.json",
    ignoreBuildErrors: process.env.NEXT_DIST_DIR === ".next-bench",
  },
  poweredByHeader: false,
  experimental: {
    authInterrupts: true,
    // A form with the shop's logo (5 MB at most) is the largest action body; lib/action-guard.ts
    // answers 413 above this in the proxy, before Next would answer a bare 500.
    serverActions: { bodySizeLimit: "6mb" },
  },
  serverExternalPackages: ["knex", "mysql2", "bcryptjs"],
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
