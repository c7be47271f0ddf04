/** @type {import('next').NextConfig} */
const nextConfig = {
  // Knex resolves optional database drivers at run time; bundling it breaks the build.
  serverExternalPackages: ["knex", "better-sqlite3"],
  // forbidden() gives protected pages a real 403 status.
  experimental: { authInterrupts: true },
  poweredByHeader: false,
  typedRoutes: false,
};

export default nextConfig;
