import type { NextConfig } from "next";

const nextConfig: NextConfig = {
  // Native or Node-only packages stay outside the server bundle.
  serverExternalPackages: ["argon2", "pdfkit", "pg"],
  poweredByHeader: false,
  typedRoutes: false,
  // The build type-checks the app; tests and scripts are checked by `npm run typecheck`.
  typescript: { tsconfigPath: "tsconfig.app.json" },
};

export default nextConfig;
