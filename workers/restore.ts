/**
 * `npm run restore -- <archive.tar.gz> [--force]`: check every hash in the archive's manifest,
 * then load the database dump into LAPBENCH_DB_NAME and put the stored upload files back.
 * Refuses to replace a database that has tables unless --force is given. Stop the web app and
 * the workers first: the restore replaces the data under them.
 */
import path from "node:path";
import { config } from "../lib/config";
import { restoreBackup } from "./services/backup";
import { startMariadb } from "./services/mariadb";

async function main() {
  const args = process.argv.slice(2);
  const archive = args.find((a) => !a.startsWith("--"));
  if (!archive) throw new Error("name the archive: npm run restore -- <file.tar.gz> [--force]");
  await startMariadb();
  const t0 = Date.now();
  const manifest = await restoreBackup({ archive, dbName: config.db.name, uploadsDir: path.join(config.dataDir, "uploads"), force: args.includes("--force") });
  console.log(`[restore] database ${manifest.database} of ${manifest.createdAt} restored into ${config.db.name}, ${manifest.entries.length - 1} stored files put back, every SHA-256 checked, in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
}

main().catch((e) => {
  console.error(`[restore] ${e instanceof Error ? e.message : String(e)}`);
  process.exit(1);
});
