import type { NextConfig } from "next";

const s3 = process.env.S3_PUBLIC_ENDPOINT ?? process.env.S3_ENDPOINT ?? "http://127.0.0.1:9390";
const s3Origin = new URL(s3).origin;

// Photos and uploads go straight between the browser and object storage, so the CSP allows that origin.
const csp = [
  "default-src 'self'",
  "script-src 'self' 'unsafe-inline'" + (process.env.NODE_ENV === "development" ? " 'unsafe-eval'" : ""),
  "style-src 'self' 'unsafe-inline'",
  `img-src 'self' data: blob: ${s3Origin}`,
  `connect-src 'self' ${s3Origin}`,
  "font-src 'self'",
  "worker-src 'self' blob:",
  "frame-ancestors 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "object-src 'none'",
].join("; ");

const nextConfig: NextConfig = {
  reactStrictMode: true,
  // Parallel local builds (e.g. several dev servers) can each use their own folder under .data/.
  distDir: process.env.NEXT_DIST_DIR ?? ".next",
  poweredByHeader: false,
  serverExternalPackages: ["@node-rs/argon2", "sharp", "pg-boss"],
  // authInterrupts: forbidden() answers a 403 with app/(lab)/forbidden.tsx (lib/auth/page.ts).
  experimental: { serverActions: { bodySizeLimit: "2mb" }, authInterrupts: true },
  async headers() {
    return [
      {
        source: "/:path*",
        headers: [
          { key: "Content-Security-Policy", value: csp },
          { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
          { key: "X-Content-Type-Options", value: "nosniff" },
          { key: "X-Frame-Options", value: "DENY" },
          { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=()" },
        ],
      },
    ];
  },
};

export default nextConfig;
