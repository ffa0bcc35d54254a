import "server-only";
/**
 * The Next app's better-auth instance (route handler, server components, server actions).
 * nextCookies() must be the last plugin: it lets server actions set the session cookie.
 */
import { betterAuth } from "better-auth";
import { nextCookies } from "better-auth/next-js";
import { getSequelize } from "../../models/db";
import { config } from "../config";
import { authOptions } from "./options";
import { sequelizeAdapter } from "./sequelize-adapter";

export { createAuth } from "./create-auth";

export const auth = betterAuth({
  ...authOptions,
  database: sequelizeAdapter(getSequelize()),
  secret: config.authSecret,
  baseURL: config.appUrl,
  plugins: [...authOptions.plugins, nextCookies()],
});

export type Auth = typeof auth;
