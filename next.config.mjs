/** @type {import('next').NextConfig} */
const nextConfig = {
  // Tests build into their own folder so `npm test` never disturbs a running `npm start`.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  poweredByHeader: false,
  experimental: {
    authInterrupts: true,
  },
  serverExternalPackages: ["knex", "mysql2", "bcryptjs"],
};
export default nextConfig;
