import fs from "node:fs";
import { parseCsvStream } from "../../lib/ingest/parse-csv-stream";
import { readCsvHeader } from "../../lib/ingest/csv-header";
import { suggestMapping } from "../../lib/ingest/suggest-mapping";
import { seriesFromParsed } from "../../workers/ingest/analyse-session";
import { analyseSeries } from "../../lib/analysis/analyse-series";
import { trackGatesForAnalysis } from "../../lib/data/tracks";
import { demoTrackInput } from "../../workers/demo-track";
import { BIKE } from "../../sample-logs/bike-model";
async function main() {
  const file = process.argv[2];
  const text = fs.readFileSync(file, "utf8").slice(0, 200000);
  const header = readCsvHeader(text, false);
  const mapping = suggestMapping(header.columns, header.sampleRows) as any;
  const parsed = await parseCsvStream(fs.createReadStream(file), mapping.mapping ?? mapping);
  const series = seriesFromParsed(parsed);
  const ti = demoTrackInput();
  const gates = trackGatesForAnalysis({ gates: ti.gates as any, lengthM: ti.lengthM ?? null, thresholds: null } as any);
  const track = { gates, pitSpeedLimitMs: (ti.pitSpeedLimitKmh ?? 60) / 3.6, thresholds: null };
  const bike = { revCeilingRpm: (BIKE as any).revCeilingRpm ?? 14000, forkStrokeM: 0.12, shockStrokeM: 0.06 };
  let out = "";
  for (let r = 0; r < Number(process.argv[3] ?? 5); r++) {
    const t = performance.now();
    const a = analyseSeries(series, track, bike);
    out = JSON.stringify(a);
    console.log(`analyseSeries ${(performance.now() - t).toFixed(0)} ms, ${a.laps.length} laps, ${a.findings.length} findings`);
  }
  if (process.argv[4]) fs.writeFileSync(process.argv[4], out);
}
main();
