import type { NextConfig } from "next";

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
};

export default nextConfig;
