import type { NextConfig } from "next";

const nextConfig: NextConfig = {
  // Server-side packages that must not be bundled (native-ish drivers, SMTP, Sequelize's dynamic requires).
  serverExternalPackages: ["sequelize", "mariadb", "nodemailer", "umzug"],
  allowedDevOrigins: ["127.0.0.1"],
  poweredByHeader: false,
  experimental: { serverActions: { bodySizeLimit: "2mb" } },
};

export default nextConfig;
