/** @type {import('next').NextConfig} */
const nextConfig = {
  // Tests build into their own folder so `npm test` never disturbs a running `npm start`.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  // Each build checks types against its own generated route types only (see tsconfig.test-build.json).
  typescript: { tsconfigPath: process.env.NEXT_DIST_DIR === ".next-test" ? "tsconfig.test-build.json" : "tsconfig.json" },
  poweredByHeader: false,
  experimental: {
    authInterrupts: true,
  },
  serverExternalPackages: ["knex", "mysql2", "bcryptjs"],
};
export default nextConfig;
