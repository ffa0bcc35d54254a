/**
 * `npm run bench`: each benchmark as its own process, one after the other (they would otherwise
 * share the 2 cores and skew each other): ingest, then compare, then load (those present).
 * Arguments are passed on to every benchmark. Exits non-zero only when a benchmark crashes;
 * a missed target is printed, not failed.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";

const here = __dirname;
const root = path.resolve(here, "../..");
const benches = ["ingest.ts", "compare.ts", "load.ts"].filter((f) => fs.existsSync(path.join(here, f)));
let failed = 0;
for (const b of benches) {
  console.log(`\n=== tests/bench/${b} ===\n`);
  const r = spawnSync(process.execPath, ["--import", "tsx", path.join(here, b), ...process.argv.slice(2)], { cwd: root, stdio: "inherit" });
  if (r.status !== 0) {
    failed++;
    console.error(`tests/bench/${b} exited with ${r.status ?? r.signal}`);
  }
}
if (!benches.includes("compare.ts")) console.log("\n(tests/bench/compare.ts is not there yet: skipped)");
process.exit(failed ? 1 : 0);
