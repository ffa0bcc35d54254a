/**
 * The raw baseline, run as its own process so its memory and JIT state match the worker's:
 * papaparse streaming the file from disk (`chunk` mode), parseFloat into growable typed arrays
 * (Float64 time, Float32 channels), nothing else — no validation, no units, no database.
 * Prints one JSON line: { seconds, rows, channels, peakRssMb }.
 *
 *   node --import tsx tests/bench/baseline-parse.ts <file.csv>
 */
import fs from "node:fs";
import Papa from "papaparse";
import { procStatusMb } from "./proc-memory";
import { at } from "../fixtures/at";

const file = process.argv[2] ?? "";
if (!file) throw new Error("usage: baseline-parse.ts <file.csv>");

/** Lines before the first data row: `# key: value` lines plus the header. */
function preambleLines(path: string): { skip: number; columns: number } {
  const fd = fs.openSync(path, "r");
  const head = Buffer.alloc(65536);
  const n = fs.readSync(fd, head, 0, head.length, 0);
  fs.closeSync(fd);
  const lines = head.subarray(0, n).toString("utf8").split("\n");
  const header = lines.findIndex((l) => !l.startsWith("#"));
  return { skip: header + 1, columns: at(lines, header).split(",").length };
}

async function main(): Promise<void> {
  const t0 = performance.now();
  const { skip, columns } = preambleLines(file);
  const nch = columns - 1;
  let capacity = 4096;
  let timeS = new Float64Array(capacity);
  let values: Float32Array[] = Array.from({ length: nch }, () => new Float32Array(capacity));
  let rows = 0;
  let toSkip = skip;
  await new Promise<void>((resolve, reject) => {
    Papa.parse<string[]>(fs.createReadStream(file, { encoding: "utf8" }), {
      delimiter: ",",
      newline: "\n",
      chunk: (results) => {
        const data = results.data;
        for (let r = 0; r < data.length; r++) {
          const row = at(data, r);
          if (toSkip > 0) {
            toSkip--;
            continue;
          }
          if (row.length !== columns) continue; // the trailing empty line
          if (rows === capacity) {
            capacity *= 2;
            const t = new Float64Array(capacity);
            t.set(timeS);
            timeS = t;
            values = values.map((v) => {
              const w = new Float32Array(capacity);
              w.set(v);
              return w;
            });
          }
          timeS[rows] = parseFloat(at(row, 0));
          for (let k = 0; k < nch; k++) at(values, k)[rows] = parseFloat(at(row, k + 1));
          rows++;
        }
      },
      complete: () => resolve(),
      error: (e: Error) => reject(e),
    });
  });
  const seconds = (performance.now() - t0) / 1000;
  console.log(JSON.stringify({ seconds, rows, channels: nch, peakRssMb: procStatusMb(process.pid, "VmHWM") }));
}

main().catch((e: unknown) => {
  console.error(e);
  process.exit(1);
});
