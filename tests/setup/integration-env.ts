// Runs in each integration-test worker before the test file: point every module at this run's database.
import { inject } from "vitest";

process.env.LAPBENCH_DB_NAME = inject("dbName");
