import { XMLBuilder } from "fast-xml-parser";
import type { Lap } from "@/lib/laps/types";

export interface GpxFixes {
  timeS: ArrayLike<number>;
  latDeg: ArrayLike<number>;
  lonDeg: ArrayLike<number>;
  /** Altitude above mean sea level, m (optional). */
  altM?: ArrayLike<number>;
}

export interface GpxMeta {
  /** Wall-clock instant of session time 0. */
  sessionStartedAt: Date;
  /** Track (trk) name, e.g. "Session 3 – Lap 7". */
  name: string;
  /** Free text for the track description. */
  description?: string;
}

/** GPX 1.1 namespace (topografix.com GPX 1.1 schema). */
export const GPX_NS = "http://www.topografix.com/GPX/1/1";

/**
 * One lap's GPS fixes as a GPX 1.1 document: one trk with one trkseg, a trkpt per finite fix with
 * startTimeS ≤ t ≤ endTimeS, lat/lon to 7 decimals (≈ 1 cm), optional ele in m, time in
 * ISO 8601 UTC with milliseconds. Built with fast-xml-parser's XMLBuilder (escapes text).
 */
export function lapToGpx(lap: Lap, fixes: GpxFixes, meta: GpxMeta): string {
  const t0Ms = meta.sessionStartedAt.getTime();
  if (!Number.isFinite(t0Ms)) throw new RangeError("lapToGpx: sessionStartedAt is not a valid date");
  const iso = (tS: number) => new Date(t0Ms + Math.round(tS * 1000)).toISOString();
  const trkpt: Record<string, unknown>[] = [];
  for (let i = 0; i < fixes.timeS.length; i++) {
    const t = fixes.timeS[i]!;
    const lat = fixes.latDeg[i]!;
    const lon = fixes.lonDeg[i]!;
    if (t < lap.startTimeS || t > lap.endTimeS || !Number.isFinite(lat) || !Number.isFinite(lon)) continue;
    const pt: Record<string, unknown> = { "@_lat": lat.toFixed(7), "@_lon": lon.toFixed(7) };
    const alt = fixes.altM?.[i];
    if (alt !== undefined && Number.isFinite(alt)) pt.ele = alt.toFixed(2);
    pt.time = iso(t);
    trkpt.push(pt);
  }
  const doc = {
    "?xml": { "@_version": "1.0", "@_encoding": "UTF-8" },
    gpx: {
      "@_version": "1.1",
      "@_creator": "Lapbench",
      "@_xmlns": GPX_NS,
      metadata: { name: meta.name, time: iso(lap.startTimeS) },
      trk: {
        name: meta.name,
        ...(meta.description ? { desc: meta.description } : {}),
        type: lap.outLap ? "out-lap" : lap.inLap ? "in-lap" : "lap",
        trkseg: { trkpt },
      },
    },
  };
  const builder = new XMLBuilder({ ignoreAttributes: false, attributeNamePrefix: "@_", format: true });
  return builder.build(doc);
}
