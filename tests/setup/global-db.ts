/**
 * Integration tests: start (or reuse) the project's MariaDB, create a database of this run's own,
 * migrate it, hand its name to the test workers, drop it at the end.
 */
import type { TestProject } from "vitest/node";
import { startMariadb, ensureDatabase, dropDatabase } from "../../workers/services/mariadb";
import { createSequelize } from "../../models/db";
import { migrateUp } from "../../models/migrate";

export default async function setup(project: TestProject) {
  await startMariadb();
  const name = `lapbench_test_${process.pid}`;
  dropDatabase(name);
  ensureDatabase(name);
  const s = createSequelize(name);
  await migrateUp(s, { quiet: true });
  await s.close();
  process.env.LAPBENCH_DB_NAME = name;
  project.provide("dbName", name);
  return async () => {
    if (!process.env.LAPBENCH_KEEP_TEST_DB) dropDatabase(name);
  };
}

declare module "vitest" {
  export interface ProvidedContext {
    dbName: string;
  }
}
