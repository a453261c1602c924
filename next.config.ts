import type { NextConfig } from "next";

const nextConfig: NextConfig = {
  // Native or Node-only packages stay outside the server bundle.
  serverExternalPackages: ["argon2", "pdfkit", "pg"],
  poweredByHeader: false,
  typedRoutes: false,
};

export default nextConfig;
