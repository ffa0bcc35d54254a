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
  // No framing, nosniff, Referrer-Policy, HSTS under https. The CSP (no 'unsafe-eval' in production)
  // names the upload service's address, which is known only when the server runs: proxy.ts sets it.
  async headers() {
    const dev = process.env.NODE_ENV === "development";
    const all = securityHeaders({ dev, appUrl, uploadOrigins: uploadOriginsFromEnv(process.env) });
    const csp = all.filter((h) => h.key === "Content-Security-Policy");
    // API answers are never rendered as pages; their CSP (frame-ancestors, no scripts) is set here.
    return [
      { source: "/:path*", headers: all.filter((h) => h.key !== "Content-Security-Policy") },
      { source: "/api/:path*", headers: csp },
    ];
  },
};

export default nextConfig;
