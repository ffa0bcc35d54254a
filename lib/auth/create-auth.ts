/**
 * A better-auth instance on a given Sequelize connection, without Next's cookie plugin: for seed
 * scripts, workers and tests (plain Node; no "server-only" import, so tsx can load it).
 * The Next app uses `auth` from lib/auth/auth.ts.
 */
import { betterAuth } from "better-auth";
import type { Sequelize } from "sequelize";
import { config } from "../config";
import { authOptions } from "./options";
import { sequelizeAdapter } from "./sequelize-adapter";

export interface CreateAuthOptions {
  /** Mail the address-confirmation link on sign-up, as the web app does. Off for scripts (the seed). */
  sendVerificationOnSignUp?: boolean;
}

export function createAuth(sequelize: Sequelize, opts: CreateAuthOptions = {}) {
  return betterAuth({
    ...authOptions,
    emailVerification: { ...authOptions.emailVerification, sendOnSignUp: opts.sendVerificationOnSignUp ?? false },
    database: sequelizeAdapter(sequelize),
    secret: config.authSecret,
    baseURL: config.appUrl,
  });
}

export type LapbenchAuth = ReturnType<typeof createAuth>;
