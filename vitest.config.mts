import { defineConfig } from "vitest/config";
import path from "node:path";
import { fileURLToPath } from "node:url";

const here = path.dirname(fileURLToPath(import.meta.url));

const alias = { "@": here, "server-only": path.join(here, "tests/setup/server-only-stub.ts") };

export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        extends: true,
        test: { name: "unit", include: ["tests/unit/**/*.test.ts"], environment: "node" },
      },
      {
        extends: true,
        test: {
          name: "integration",
          include: ["tests/integration/**/*.test.ts"],
          environment: "node",
          globalSetup: ["tests/setup/global-db.ts"],
          setupFiles: ["tests/setup/integration-env.ts"],
          testTimeout: 60_000,
          hookTimeout: 120_000,
          // One file at a time: files share one MariaDB and one job queue, and the worker processes
          // some tests start would otherwise take jobs queued by another file.
          fileParallelism: false,
        },
      },
      {
        extends: true,
        test: {
          name: "e2e",
          include: ["tests/e2e/**/*.test.ts"],
          environment: "node",
          globalSetup: ["tests/setup/global-app.ts"],
          testTimeout: 120_000,
          hookTimeout: 600_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
