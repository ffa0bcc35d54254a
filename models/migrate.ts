/** Runs the versioned migrations (models/migrations) with umzug against a Sequelize connection. */
import { Umzug, SequelizeStorage } from "umzug";
import type { Sequelize } from "sequelize";
import { migrations } from "./migrations";

export function migrator(sequelize: Sequelize, opts: { quiet?: boolean } = {}) {
  return new Umzug({
    migrations: migrations.map((m) => ({ name: m.name, up: m.up, down: m.down })),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: "lapbench_migrations" }),
    logger: opts.quiet ? undefined : { info: (e) => console.log(`[migrate] ${JSON.stringify(e)}`), warn: console.warn, error: console.error, debug: () => {} },
  });
}

export async function migrateUp(sequelize: Sequelize, opts: { quiet?: boolean } = {}): Promise<string[]> {
  const done = await migrator(sequelize, opts).up();
  return done.map((m) => m.name);
}
