/** @type {import('next').NextConfig} */

// Security headers on every page and API answer. Next's App Router bootstraps with inline scripts (no nonce here), and
// the plotting library injects its styles, so scripts and styles allow 'unsafe-inline' but load from this origin only;
// nothing may frame the app; the development server also needs eval for fast refresh.
const dev = process.env.NODE_ENV === "development";
const https = (process.env.NEXTAUTH_URL ?? "").startsWith("https://");
const csp = [
  "default-src 'self'",
  `script-src 'self' 'unsafe-inline'${dev ? " 'unsafe-eval'" : ""}`,
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self' data:",
  "connect-src 'self'",
  "worker-src 'self' blob:",
  "object-src 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "frame-ancestors 'none'",
].join("; ");
const securityHeaders = [
  { key: "Content-Security-Policy", value: csp },
  { key: "X-Content-Type-Options", value: "nosniff" },
  // same-origin, not no-referrer: under no-referrer browsers send "Origin: null" with same-origin form posts, and the
  // server actions' own origin check then has nothing to compare; other sites still get no referrer (share tokens).
  { key: "Referrer-Policy", value: "same-origin" },
  { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=(), payment=(), usb=(), interest-cohort=()" },
  { key: "X-Frame-Options", value: "DENY" },
  ...(https ? [{ key: "Strict-Transport-Security", value: "max-age=31536000; includeSubDomains" }] : []),
];

const nextConfig = {
  // Knex resolves optional database drivers at run time; bundling it breaks the build. pdfkit and fontkit read font
  // files through Node's fs: bundled, fontkit resolves to its browser build (no openSync).
  serverExternalPackages: ["knex", "better-sqlite3", "pg", "pdfkit", "fontkit"],
  // forbidden() gives protected pages a real 403 status.
  experimental: { authInterrupts: true },
  poweredByHeader: false,
  typedRoutes: false,
  async headers() {
    return [{ source: "/:path*", headers: securityHeaders }];
  },
};

export default nextConfig;
