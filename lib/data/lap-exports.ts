import "server-only";
/** The lap table as CSV and one lap as GPX, for the export routes. */
import { getSequelize } from "@/models/db";
import { initModels, RideSession } from "@/models";
import type { TeamContext } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/http-error";
import { lapTableCsv } from "@/lib/export/lap-table-csv";
import { lapToGpx } from "@/lib/export/lap-to-gpx";
import { listSessionLaps, toLibLap } from "./laps";
import { listChannels } from "./samples";
import { readLapWindow } from "./lap-window";

/** A file name made only of safe characters. */
export function safeFileName(s: string): string {
  return s.replace(/[^A-Za-z0-9._-]+/g, "-").replace(/^-+|-+$/g, "").slice(0, 80) || "session";
}

export async function sessionLapTableCsv(ctx: TeamContext, sessionId: number): Promise<{ fileName: string; csv: string }> {
  const { session, laps } = await listSessionLaps(ctx, sessionId);
  // The title is user-entered: lapTableCsv neutralises formula-looking text cells.
  const csv = lapTableCsv(laps.map(toLibLap), { sessionLabel: session.title });
  return { fileName: `${safeFileName(session.title)}-laps.csv`, csv };
}

export async function sessionLapGpx(ctx: TeamContext, sessionId: number, lapNumber: number): Promise<{ fileName: string; gpx: string }> {
  const { session, laps } = await listSessionLaps(ctx, sessionId);
  const lap = laps.find((l) => l.number === lapNumber);
  if (!lap) throw new HttpError(404, `Lap ${lapNumber} was not found in this session.`);
  const sequelize = getSequelize();
  const channels = await listChannels(sequelize, sessionId);
  if (!channels.some((c) => c.role === "gps_lat") || !channels.some((c) => c.role === "gps_lon"))
    throw new HttpError(422, "This session has no GPS position channels, so a lap cannot be written as GPX.");
  const { timeS, data } = await readLapWindow(sequelize, channels, lap, ["gps_lat", "gps_lon", "gps_alt"]);
  initModels();
  const row = await RideSession.findByPk(sessionId);
  // Session time 0 is the log's first row; without a recorded start the upload time stands in.
  const startedAt = row?.startedAt ?? row?.createdAt ?? new Date(session.createdAt);
  const name = `${session.title} – Lap ${lap.number}`;
  const gpx = lapToGpx(toLibLap(lap), { timeS, latDeg: data.get("gps_lat")!, lonDeg: data.get("gps_lon")!, altM: data.get("gps_alt") }, { sessionStartedAt: startedAt, name, description: "Exported from Lapbench" });
  return { fileName: `${safeFileName(session.title)}-lap-${lap.number}.gpx`, gpx };
}
