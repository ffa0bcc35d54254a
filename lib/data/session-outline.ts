/**
 * The outline to draw for a session: the track's stored outline when it has one, else the
 * session's own GPS path (the first flying laps are enough to show the shape).
 */
import type { Sequelize } from "sequelize";
import { initModels, Track } from "@/models";
import { outlineFromFixes, type Outline } from "@/lib/geo/outline-path";
import { loadSessionSeries } from "./session-series";
import { jsonColumn } from "./json-column";

export type { Outline };

export async function sessionOutline(sequelize: Sequelize, sessionId: number, trackId: number | null): Promise<Outline | null> {
  initModels(sequelize);
  const track = trackId ? await Track.findByPk(trackId) : null;
  const stored = jsonColumn<[number, number][]>(track?.outline);
  if (stored && stored.length > 2) return outlineFromFixes(stored.map((p) => p[0]), stored.map((p) => p[1]), 2);
  const { series } = await loadSessionSeries(sequelize, sessionId, ["gps_lat", "gps_lon"]);
  const { gps_lat: lat, gps_lon: lon } = series.channels;
  return lat && lon ? outlineFromFixes(lat, lon) : null;
}
