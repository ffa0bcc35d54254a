/**
 * `npm run backup [-- --out <file.tar.gz>]`: the database (mariadb-dump --single-transaction, so
 * the app keeps running) and every stored upload file in one archive with a manifest of SHA-256
 * hashes. Default: `<data dir>/backups/lapbench-<database>-<UTC time>.tar.gz`.
 */
import path from "node:path";
import { config } from "../lib/config";
import { createBackup } from "./services/backup";
import { pingMariadb } from "./services/mariadb";

async function main() {
  const at = process.argv.indexOf("--out");
  const stamp = new Date().toISOString().replace(/[:.]/g, "-");
  const outFile = at > 0 && process.argv[at + 1] ? process.argv[at + 1] : path.join(config.dataDir, "backups", `lapbench-${config.db.name}-${stamp}.tar.gz`);
  if (!pingMariadb()) throw new Error("MariaDB is not running: start Lapbench (npm start) first.");
  const t0 = Date.now();
  const { file, manifest } = await createBackup({ dbName: config.db.name, uploadsDir: path.join(config.dataDir, "uploads"), outFile });
  const files = manifest.entries.length - 1;
  const bytes = manifest.entries.reduce((n, e) => n + e.bytes, 0);
  console.log(`[backup] ${file}`);
  console.log(`[backup] database ${manifest.database} (${manifest.server}) and ${files} stored files, ${(bytes / 1048576).toFixed(1)} MB before compression, in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
}

main().catch((e) => {
  console.error(`[backup] failed: ${e instanceof Error ? e.message : String(e)}`);
  process.exit(1);
});
