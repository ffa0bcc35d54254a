/**
 * Load a stored session's samples back into the in-memory SessionSeries shape the lib/
 * computations take (lib/channels/roles.ts). Channels with role "other" go to `others` by name.
 */
import type { Sequelize } from "sequelize";
import type { ChannelRole, SessionSeries } from "@/lib/channels/roles";
import { listChannels, readChannels, type ChannelInfo } from "./samples";

export interface LoadedSeries {
  series: SessionSeries;
  channels: ChannelInfo[];
}

/** `roles` limits what is read (time is always read); omitted = every channel. */
export async function loadSessionSeries(sequelize: Sequelize, sessionId: number, roles?: readonly ChannelRole[]): Promise<LoadedSeries> {
  const all = await listChannels(sequelize, sessionId);
  const wanted = all.filter((c) => c.role === "time" || !roles || roles.includes(c.role as ChannelRole));
  const data = await readChannels(sequelize, wanted);
  const time = wanted.find((c) => c.role === "time");
  const series: SessionSeries = { timeS: time ? (data.get(time.id) as Float64Array) : new Float64Array(0), channels: {}, others: {} };
  for (const c of wanted) {
    if (c.role === "time") continue;
    const values = data.get(c.id)!;
    if (c.role === "other") series.others![c.name] = values as Float32Array;
    else (series.channels as Record<string, Float32Array | Float64Array>)[c.role] = values;
  }
  return { series, channels: all };
}
