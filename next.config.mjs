/** @type {import('next').NextConfig} */
const nextConfig = {
  // A separate build folder lets a second checkout-local build (e.g. a test run) leave the served one alone.
  distDir: process.env.PINCHPOINT_DIST_DIR || ".next",
  // Sequelize loads its dialect module dynamically; bundling it breaks every query at run time.
  // Piscina starts its worker threads from its own files on disk. pg-boss and mailparser read their
  // own files (version, tables) at run time.
  serverExternalPackages: ["sequelize", "pg", "pg-hstore", "piscina", "pg-boss", "mailparser"],
  poweredByHeader: false,
  reactStrictMode: true,
  // `npm test` runs `tsc --noEmit` over the whole project as its own step; checking again inside
  // every build would only repeat it.
  typescript: { ignoreBuildErrors: true },
  // The fixed security headers, on every response (static files included). They are repeated here
  // rather than imported from lib/security-headers.ts because this file is plain JavaScript read by
  // Next before any TypeScript is compiled; tests/lib/security-headers.test.ts holds the two
  // lists equal. The per-request page policy (nonce) and HSTS come from proxy.ts.
  async headers() {
    return [
      {
        source: "/:path*",
        headers: [
          { key: "X-Content-Type-Options", value: "nosniff" },
          { key: "Referrer-Policy", value: "same-origin" },
          { key: "X-Frame-Options", value: "DENY" },
          { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
          { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=(), payment=()" },
        ],
      },
      { source: "/api/:path*", headers: [{ key: "Content-Security-Policy", value: "default-src 'none'; frame-ancestors 'none'" }] },
    ];
  },
};

export default nextConfig;
