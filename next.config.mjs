/** @type {import('next').NextConfig} */
const nextConfig = {
  reactStrictMode: true,
  poweredByHeader: false,
  // Several builds may coexist (tests build into their own folder).
  distDir: process.env.NEXT_DIST_DIR || ".next",
  // Native SQLite driver: load it from node_modules at run time instead of bundling it.
  serverExternalPackages: ["better-sqlite3", "@prisma/adapter-better-sqlite3"],
  // Types are checked by `npm run typecheck`, which `npm test` runs first.
  typescript: { ignoreBuildErrors: true },
  // Security headers on every response; pages get their CSP with a nonce from proxy.ts.
  async headers() {
    const common = [
      { key: "X-Content-Type-Options", value: "nosniff" },
      { key: "Referrer-Policy", value: "no-referrer" },
      { key: "X-Frame-Options", value: "DENY" },
      { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=(), payment=()" },
      { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
    ];
    return [
      { source: "/:path*", headers: common },
      // JSON and CSV need no scripts, styles or frames.
      { source: "/api/:path*", headers: [{ key: "Content-Security-Policy", value: "default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'" }] },
    ];
  },
};

export default nextConfig;
