/**
 * `npm test`: unit, integration (real MariaDB, started by the test setup) and end-to-end
 * (headless Chromium against a production build) tests in one vitest run, then a closing line
 * "N passed, N failed" read from vitest's JSON report so CI shows the count.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";

const root = path.resolve(__dirname, "..");
const outDir = path.join(root, "test-output");
fs.mkdirSync(outDir, { recursive: true });
const report = path.join(outDir, "vitest-report.json");
fs.rmSync(report, { force: true });

const extra = process.argv.slice(2);
const r = spawnSync(
  process.execPath,
  [path.join(root, "node_modules", "vitest", "vitest.mjs"), "run", "--reporter=default", "--reporter=json", `--outputFile.json=${report}`, ...extra],
  { cwd: root, stdio: "inherit", env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" } },
);

let passed = 0;
let failed = 0;
let skipped = 0;
if (fs.existsSync(report)) {
  const j = JSON.parse(fs.readFileSync(report, "utf8")) as { numPassedTests: number; numFailedTests: number; numPendingTests: number; numTodoTests: number };
  passed = j.numPassedTests;
  failed = j.numFailedTests;
  skipped = j.numPendingTests + j.numTodoTests;
}
const code = r.status ?? 1;
if (code !== 0 && failed === 0) failed = 1; // a crash outside a test still fails the run
console.log(`\n${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ""}`);
process.exit(code === 0 && failed === 0 ? 0 : 1);
