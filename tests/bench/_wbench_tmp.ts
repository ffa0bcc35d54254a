import fs from "node:fs";
import { QueryTypes } from "sequelize";
import { getSequelize } from "../../models/db";
import { initModels, RideSession } from "../../models";
import { writeSessionSamples } from "../../lib/data/samples";
const pid = Number(fs.readFileSync("/work/main/.data/mariadb-run/mysqld.pid", "utf8"));
const cpu = () => { const f = fs.readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1].split(" "); return (Number(f[11]) + Number(f[12])) / 100; };
async function main() {
  const sequelize = getSequelize(); initModels(sequelize);
  const s = await RideSession.findOne({ where: { status: "ready" } });
  const rows = Number(process.argv[2] ?? 240000), nch = 40;
  const timeS = new Float64Array(rows).map((_, i) => i / 100);
  const channels = Array.from({ length: nch }, (_, k) => { const v = new Float32Array(rows); for (let i = 0; i < rows; i++) v[i] = Math.sin(i * 0.001 * (k + 1)) * 100; return { name: `c${k}`, role: "other" as const, unit: "", values: v, sampleCount: rows, min: -100, max: 100 }; });
  for (let r = 0; r < 3; r++) {
    const tx = await sequelize.transaction();
    const c0 = cpu(); const t0 = performance.now();
    await writeSessionSamples(sequelize, tx, s!.id, { timeS, channels, metadata: {}, rows });
    const w = (performance.now() - t0) / 1000; const cw = cpu() - c0;
    const t1 = performance.now(); await tx.rollback(); const rb = (performance.now() - t1) / 1000;
    console.log(`write ${w.toFixed(2)} s (server cpu ${cw.toFixed(2)} s) ${(rows * nch * 4 / 1e6 / w).toFixed(0)} MB/s; rollback ${rb.toFixed(2)} s`);
  }
  await sequelize.close();
}
main();
