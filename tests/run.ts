/**
 * `npm test`: unit, integration (real MariaDB, started by the test setup) and end-to-end
 * (headless Chromium against a production build) tests, after the typecheck and the lint, one
 * project after the other so the browser tests do not compete with the database tests for the
 * machine's two cores. Ends with a
 * closing line "N passed, N failed" summed from vitest's JSON reports, so CI shows the count.
 * Extra arguments go to every vitest run (e.g. a file filter).
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";

const root = path.resolve(__dirname, "..");
const outDir = path.join(root, "test-output");
fs.mkdirSync(outDir, { recursive: true });
const only = process.env.LAPBENCH_TEST_PROJECTS?.split(",").filter(Boolean);
const projects = only?.length ? only : ["unit", "integration", "e2e"];
const extra = process.argv.slice(2);

// Type errors anywhere (tests and scripts included) fail the run before any test starts.
console.log("=== typecheck (tsc --noEmit) ===");
const tsc = spawnSync(process.execPath, [path.join(root, "node_modules", "typescript", "bin", "tsc"), "--noEmit", "-p", root], { cwd: root, stdio: "inherit" });
if (tsc.status !== 0) {
  console.log("\n0 passed, 1 failed");
  process.exit(1);
}

// Lint next (eslint.config.mjs: the Next.js and react-hooks rules and the layer rules), warnings
// included: a violation fails the run the same way.
console.log("\n=== lint (eslint . --max-warnings=0) ===");
const lint = spawnSync(process.execPath, [path.join(root, "node_modules", "eslint", "bin", "eslint.js"), ".", "--max-warnings=0"], { cwd: root, stdio: "inherit" });
if (lint.status !== 0) {
  console.log("\n0 passed, 1 failed");
  process.exit(1);
}

let passed = 0;
let failed = 0;
let skipped = 0;
let anyError = false;
for (const project of projects) {
  const report = path.join(outDir, `vitest-${project}.json`);
  fs.rmSync(report, { force: true });
  console.log(`\n=== ${project} tests ===`);
  const t0 = Date.now();
  const r = spawnSync(
    process.execPath,
    [path.join(root, "node_modules", "vitest", "vitest.mjs"), "run", "--project", project, "--reporter=default", "--reporter=json", `--outputFile.json=${report}`, ...extra],
    { cwd: root, stdio: "inherit", env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1", VITE_CONFIG_NATIVE_IGNORE_WARNING: "true" } },
  );
  let p = 0;
  let f = 0;
  if (fs.existsSync(report)) {
    const j = JSON.parse(fs.readFileSync(report, "utf8")) as { numPassedTests: number; numFailedTests: number; numPendingTests: number; numTodoTests: number };
    p = j.numPassedTests;
    f = j.numFailedTests;
    skipped += j.numPendingTests + j.numTodoTests;
  }
  if (r.status !== 0) {
    anyError = true;
    if (f === 0) f = 1; // a crash outside a test (setup, build) still fails the run
  }
  passed += p;
  failed += f;
  console.log(`=== ${project}: ${p} passed, ${f} failed in ${Math.round((Date.now() - t0) / 1000)} s ===`);
}
console.log(`\n${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ""}`);
process.exit(!anyError && failed === 0 ? 0 : 1);
