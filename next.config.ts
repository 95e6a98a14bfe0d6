import type { NextConfig } from "next";

const nextConfig: NextConfig = {
  // Sequelize resolves optional dialect drivers at runtime; bundling it breaks the build
  // (sequelize#16589, next.js#56295).
  serverExternalPackages: ["sequelize", "sqlite3", "smtp-server", "mailparser", "nodemailer"],
  // Separate build folders let tests and parallel local builds not trample each other.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  poweredByHeader: false,
};

export default nextConfig;
