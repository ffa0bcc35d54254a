import fs from "node:fs";
import { parseCsvStream, type SampleSink } from "../../lib/ingest/parse-csv-stream";
import { readCsvHeader } from "../../lib/ingest/csv-header";
import { suggestMapping } from "../../lib/ingest/suggest-mapping";
import { ANALYSED_ROLES } from "../../workers/ingest/analyse-session";
async function main() {
  const file = process.argv[2];
  const rowsPerBlock = Number(process.argv[3] ?? 10000);
  const text = fs.readFileSync(file, "utf8").slice(0, 200000);
  const h = readCsvHeader(text, false);
  const mapping = suggestMapping(h.columns, h.sampleRows);
  const ref = await parseCsvStream(fs.createReadStream(file), mapping);
  const got: { start: number; n: number; t: Float64Array; v: Float32Array[] }[] = [];
  let bytesQueued = 0;
  const sink: SampleSink = { blockRows: rowsPerBlock, start() {}, block(start, n, t, v) { if (t.length !== n) throw new Error("len"); got.push({ start, n, t: t.slice(), v: v.map((x) => x.slice() as Float32Array) }); bytesQueued += n; }, async ready() {} };
  const s = await parseCsvStream(fs.createReadStream(file, { highWaterMark: 7777 }), mapping, undefined, undefined, { sink, keep: (r) => ANALYSED_ROLES.has(r), expectedBytes: fs.statSync(file).size });
  const eq = (a: ArrayLike<number>, b: ArrayLike<number>) => { if (a.length !== b.length) return false; for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false; return true; };
  let ok = eq(ref.timeS, s.timeS) && ref.rows === s.rows;
  for (let k = 0; k < ref.channels.length; k++) {
    const a = ref.channels[k], b = s.channels[k];
    if (a.sampleCount !== b.sampleCount || !Object.is(a.min, b.min) || !Object.is(a.max, b.max)) ok = false;
    if (ANALYSED_ROLES.has(a.role)) { if (!eq(a.values, b.values)) { ok = false; console.log("kept differs", a.name); } } else if (b.values.length !== 0) ok = false;
    // reassemble the sink pieces
    const re = new (a.values.constructor as any)(ref.rows);
    let at = 0;
    for (const g of got) { if (g.start !== at) { ok = false; console.log("gap", g.start, at); } re.set(g.v[k], g.start); at += g.n; }
    if (!eq(re, a.values)) { ok = false; console.log("sink differs", a.name); }
  }
  const rt = new Float64Array(ref.rows); for (const g of got) rt.set(g.t, g.start);
  if (!eq(rt, ref.timeS)) ok = false;
  console.log(ok ? "IDENTICAL" : "DIFFERENT", ref.rows, got.length, "blocks; capacity", s.timeS.buffer.byteLength / 8, "rows", s.rows, "piece sizes ok", got.slice(0, -1).every((g) => g.n === rowsPerBlock));
}
main();
