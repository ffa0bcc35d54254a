import "server-only";
import type { Sequelize } from "sequelize";
import { HttpError } from "@/lib/http/http-error";
import { readChannelRange, type ChannelInfo } from "./samples";
import type { LapRow } from "./laps";

/**
 * Read one lap's window: estimate the sample indices from the time channel's rate, read those
 * chunks with a margin, and widen once more if the estimate missed (a clock gap shifts indices).
 */
export async function readLapWindow(sequelize: Sequelize, channels: ChannelInfo[], lap: LapRow, roles: readonly string[]): Promise<{ timeS: Float64Array; data: Map<string, Float32Array | Float64Array> }> {
  const time = channels.find((c) => c.role === "time");
  if (!time || time.sampleCount < 2) throw new HttpError(422, `Session ${lap.sessionId} has no samples to compare.`);
  // The first channel of each role (the one used below): a log with two channels of one role
  // would otherwise read blobs that are thrown away.
  const wanted: ChannelInfo[] = [];
  const seen = new Set<string>();
  for (const c of channels) {
    if (c.role === "time" || seen.has(c.role) || !roles.includes(c.role)) continue;
    seen.add(c.role);
    wanted.push(c);
  }
  const t0 = time.minValue ?? 0;
  const rate = time.rateHz ?? 1;
  const margin = Math.ceil(rate) + 2; // one second of samples either side
  let start = Math.max(0, Math.floor((lap.startTimeS - t0) * rate) - margin);
  let end = Math.min(time.sampleCount, Math.ceil((lap.endTimeS - t0) * rate) + margin);
  for (let attempt = 0; ; attempt++) {
    const read = await readChannelRange(sequelize, [time, ...wanted], start, end);
    const ts = read.get(time.id) as Float64Array;
    const coversStart = start === 0 || ts[0] <= lap.startTimeS;
    const coversEnd = end >= time.sampleCount || ts[ts.length - 1] >= lap.endTimeS;
    if ((coversStart && coversEnd) || attempt >= 3) {
      const data = new Map<string, Float32Array | Float64Array>();
      for (const c of wanted) data.set(c.role, read.get(c.id)!);
      return { timeS: ts, data };
    }
    if (!coversStart) start = attempt >= 2 ? 0 : Math.max(0, start - Math.ceil((ts[0] - lap.startTimeS) * rate) - margin * 10);
    if (!coversEnd) end = attempt >= 2 ? time.sampleCount : Math.min(time.sampleCount, end + Math.ceil((lap.endTimeS - ts[ts.length - 1]) * rate) + margin * 10);
  }
}

