/**
 * The one Sequelize connection of a process. Everything that touches MariaDB goes through
 * `getSequelize()`; models are registered on it by models/index.ts.
 */
import { Sequelize } from "sequelize";
import * as mariadbDriver from "mariadb";
import { config } from "../lib/config";
import { applyMariadbRawQueryFix } from "./mariadb-raw-query-fix";

applyMariadbRawQueryFix();

declare global {
  // Survives Next's module reloading in development, so connections are not leaked.
  var __lapbenchSequelize: Sequelize | undefined;
}

export function createSequelize(dbName = config.db.name, opts: { logging?: boolean; pool?: number; port?: number } = {}): Sequelize {
  return new Sequelize(dbName, config.db.user, config.db.password, {
    dialect: "mariadb",
    dialectModule: mariadbDriver,
    host: config.db.host,
    port: opts.port ?? config.db.port,
    logging: opts.logging ? console.log : false,
    timezone: "+00:00",
    pool: { max: opts.pool ?? 10, min: 0, idle: 10_000, acquire: 30_000 },
    dialectOptions: {
      // BIGINT as Number where safe (byte counts, ids); the session time zone is UTC (timezone above).
      bigIntAsNumber: true,
      insertIdAsNumber: true,
      decimalAsNumber: true,
      connectTimeout: 10_000,
    },
    define: { underscored: true, timestamps: true },
  });
}

export function getSequelize(): Sequelize {
  if (!globalThis.__lapbenchSequelize) globalThis.__lapbenchSequelize = createSequelize();
  return globalThis.__lapbenchSequelize;
}

export function setSequelizeForProcess(s: Sequelize): void {
  globalThis.__lapbenchSequelize = s;
}
