import type { NextConfig } from "next";
import { securityHeaders, uploadOriginsFromEnv } from "./lib/security/headers";

const appUrl = process.env.BETTER_AUTH_URL ?? process.env.LAPBENCH_APP_URL ?? `http://localhost:${process.env.PORT ?? 3000}`;

const nextConfig: NextConfig = {
  // Server-side packages that must not be bundled (native-ish drivers, SMTP, Sequelize's dynamic requires).
  serverExternalPackages: ["sequelize", "mariadb", "nodemailer", "umzug"],
  allowedDevOrigins: ["127.0.0.1"],
  poweredByHeader: false,
  // The build type-checks the app's own code; `npm test` type-checks everything (tests included).
  typescript: { tsconfigPath: "tsconfig.app.json" },
  // Parallel end-to-end runs on one machine build into their own folders.
  distDir: process.env.LAPBENCH_NEXT_DIST ?? ".next",
  experimental: { serverActions: { bodySizeLimit: "2mb" } },
  // CSP (no 'unsafe-eval' in production), no framing, nosniff, Referrer-Policy, HSTS under https.
  // Read when the app is built: `npm start` builds with the upload service's address in the env.
  async headers() {
    const dev = process.env.NODE_ENV === "development";
    return [{ source: "/:path*", headers: securityHeaders({ dev, appUrl, uploadOrigins: uploadOriginsFromEnv(process.env) }) }];
  },
};

export default nextConfig;
