import type { ParsedChannel } from "./parsed-series";
import type { SampleArray } from "@/lib/channels/roles";

/** A ParsedChannel with its sample count, minimum and maximum (NaN = no sample). */
export function channelFromValues(name: string, role: ParsedChannel["role"], unit: string, values: SampleArray): ParsedChannel {
  let n = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v !== v) continue;
    n++;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return { name, role, unit, values, sampleCount: n, min: n ? min : NaN, max: n ? max : NaN };
}
