import { holdForward, type DetectorContext } from "./detector-context";
import { kmh, makeFinding, onLap } from "./make-finding";
import { maskRuns } from "./mask-runs";
import { pointInPolygon } from "@/lib/geo/point-in-polygon";
import type { Finding } from "./types";

/** The caller's pit-lane test per sample: predicate, time ranges or a GPS polygon; null if none given. */
function pitLaneTest(dc: DetectorContext): ((i: number) => boolean) | null {
  const track = dc.ctx.track;
  if (!track) return null;
  if (track.inPitLane) return track.inPitLane;
  const t = dc.series.timeS;
  if (track.pitLaneTimes?.length) {
    const ranges = track.pitLaneTimes;
    return (i) => ranges.some((r) => t[i] >= r.startTimeS && t[i] <= r.endTimeS);
  }
  const lat = dc.series.channels.gps_lat;
  const lon = dc.series.channels.gps_lon;
  if (track.pitLane && track.pitLane.length >= 3 && lat && lon) {
    const polygon = track.pitLane;
    const la = holdForward(lat);
    const lo = holdForward(lon);
    return (i) => Number.isFinite(la[i]) && pointInPolygon(la[i], lo[i], polygon);
  }
  return null;
}

/** Speed above the pit-lane limit while in the pit lane. */
export function detectPitOverspeed(dc: DetectorContext): Finding[] {
  const v = dc.groundSpeedMps;
  const inPit = pitLaneTest(dc);
  if (!v || !inPit) return [];
  const limit = dc.ctx.track?.pitSpeedLimitMps ?? dc.th.pitSpeedLimitMps;
  const runs = maskRuns(v.length, (i) => v[i] > limit && inPit(i), dc.series.timeS, {
    minDurationS: dc.th.pitOverspeedMinDurationS,
    mergeGapS: 0.5,
    dtS: dc.dtS,
  });
  return runs.map(({ start, end }) => {
    let peak = -Infinity;
    for (let i = start; i <= end; i++) if (v[i] > peak) peak = v[i];
    return makeFinding(dc, start, end, {
      kind: "pit_overspeed",
      severity: "critical",
      measuredValue: peak,
      thresholdValue: limit,
      unit: "m/s",
      message: `Pit-lane speed up to ${kmh(peak)}, above the ${kmh(limit)} limit${onLap(dc, start)}.`,
    });
  });
}

/** The channel roles this detector reads (besides the ground speed every detector gets: DETECTOR_CONTEXT_READS). */
detectPitOverspeed.reads = ["gps_lat", "gps_lon"] as const;
