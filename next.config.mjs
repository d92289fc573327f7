/** @type {import('next').NextConfig} */
const securityHeaders = [
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=()" },
  {
    key: "Content-Security-Policy",
    value: [
      "default-src 'self'",
      "script-src 'self' 'unsafe-inline'",
      "style-src 'self' 'unsafe-inline'",
      "img-src 'self' data: blob: http://127.0.0.1:* http://localhost:* https:",
      "font-src 'self'",
      "connect-src 'self' http://127.0.0.1:* http://localhost:* https:",
      "form-action 'self' http://127.0.0.1:* http://localhost:* https:",
      "frame-ancestors 'none'",
      "object-src 'none'",
      "base-uri 'none'",
    ].join("; "),
  },
];

const nextConfig = {
  distDir: process.env.NEXT_DIST_DIR || ".next",
  poweredByHeader: false,
  productionBrowserSourceMaps: false,
  reactStrictMode: true,
  serverExternalPackages: ["pg-boss", "@node-rs/argon2", "sharp"],
  async headers() {
    return [
      { source: "/:path*", headers: securityHeaders },
      { source: "/(portal|bench|office|api)/:path*", headers: [{ key: "Cache-Control", value: "no-store" }] },
    ];
  },
};

export default nextConfig;
