const isDev = process.env.NODE_ENV !== "production";

// Next inlines its bootstrap scripts, hence 'unsafe-inline' for scripts; nothing loads from elsewhere.
const csp = [
  "default-src 'self'",
  `script-src 'self' 'unsafe-inline'${isDev ? " 'unsafe-eval'" : ""}`,
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "media-src 'self' blob:",
  "frame-ancestors 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "object-src 'none'",
].join("; ");

/** @type {import('next').NextConfig} */
const nextConfig = {
  // Side-by-side test runs (TEST_SLOT) build into their own folder.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  poweredByHeader: false,
  // Side-by-side development runs skip the build's type check (each engineer runs tsc on their
  // own files); CI's run (no TEST_SLOT) keeps it. They build into their own folder (above)
  // and write their type paths into a tsconfig of their own (scripts/build-if-needed.ts).
  typescript: {
    ignoreBuildErrors: process.env.SKIP_BUILD_TYPECHECK === "1",
    tsconfigPath: process.env.NEXT_TSCONFIG || "tsconfig.json",
  },
  serverExternalPackages: ["knex", "pg", "pg-boss", "@node-rs/argon2"],
  // The proxy (proxy.ts) buffers request bodies and cuts them off at this size: room for a photo
  // upload (6 photos of at most 10 MB each; the route refuses more with a clear 413).
  experimental: { proxyClientMaxBodySize: 64 * 1024 * 1024 },
  async headers() {
    return [
      {
        source: "/:path*",
        headers: [
          { key: "Content-Security-Policy", value: csp },
          { key: "X-Content-Type-Options", value: "nosniff" },
          { key: "Referrer-Policy", value: "same-origin" },
          { key: "X-Frame-Options", value: "DENY" },
          { key: "Permissions-Policy", value: "camera=(self), microphone=(), geolocation=()" },
        ],
      },
    ];
  },
};

export default nextConfig;
