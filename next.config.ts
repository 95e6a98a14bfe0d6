import type { NextConfig } from "next";

// Security headers on every answer. The policy allows what the app itself uses and nothing
// else: our own scripts plus Next's inline bootstrap scripts and styles ('unsafe-inline'; no
// eval), web workers from our origin (blob: for bundler-made worker URLs), uPlot's canvas
// (no network), images and fonts from our origin or data: URLs, fetches to our own API only.
const contentSecurityPolicy = [
  "default-src 'self'",
  "script-src 'self' 'unsafe-inline'",
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

const common = [
  { key: "Content-Security-Policy", value: contentSecurityPolicy },
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "X-Frame-Options", value: "DENY" },
  {
    key: "Permissions-Policy",
    value: "camera=(), microphone=(), geolocation=(), payment=(), usb=(), interest-cohort=()",
  },
  { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
];

const nextConfig: NextConfig = {
  // Sequelize resolves optional dialect drivers at runtime; bundling it breaks the build
  // (sequelize#16589, next.js#56295). piscina and esbuild start the simulation worker threads
  // (lib/server/sim-pool.ts) and must stay plain Node packages.
  serverExternalPackages: ["sequelize", "sqlite3", "smtp-server", "mailparser", "nodemailer", "piscina", "esbuild"],
  // Separate build folders let tests and parallel local builds not trample each other.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  poweredByHeader: false,
  // No gzip in the Node process: Next compressed every streamed answer, even a 100-byte health
  // check (about 0.3 ms of CPU each on this machine); a deployment's reverse proxy compresses.
  compress: false,
  // `npx tsc --noEmit` is the type check of record; RAILWISE_BUILD_SKIP_TYPECHECK=1 lets a build
  // go through while another part of the tree is mid-edit (local parallel work only).
  typescript: { ignoreBuildErrors: process.env.RAILWISE_BUILD_SKIP_TYPECHECK === "1" },
  async headers() {
    return [
      { source: "/:path*", headers: [...common, { key: "Referrer-Policy", value: "same-origin" }] },
      // A shared run's URL is its secret: never send it on as a referrer.
      { source: "/share/:path*", headers: [{ key: "Referrer-Policy", value: "no-referrer" }] },
      { source: "/api/links/:path*", headers: [{ key: "Referrer-Policy", value: "no-referrer" }] },
      // API answers carry team data: no shared or browser cache keeps them.
      { source: "/api/:path*", headers: [{ key: "Cache-Control", value: "no-store" }] },
    ];
  },
};

export default nextConfig;
