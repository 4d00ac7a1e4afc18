/** @type {import('next').NextConfig} */
const nextConfig = {
  // Sequelize loads its dialect module dynamically; bundling it breaks every query at run time.
  serverExternalPackages: ["sequelize", "pg", "pg-hstore"],
  poweredByHeader: false,
  reactStrictMode: true,
  typedRoutes: false,
};

export default nextConfig;
