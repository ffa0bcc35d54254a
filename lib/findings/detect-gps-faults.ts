import type { DetectorContext } from "./detector-context";
import { haversineM } from "@/lib/geo/haversine-m";
import { validFix } from "@/lib/laps/extract-fixes";
import { kmh, makeFinding, onLap } from "./make-finding";
import type { Finding } from "./types";

/**
 * GPS dropouts (no fix for longer than the set gap while moving) and jumps (a fix-to-fix speed
 * above the absolute limit, or above a multiple of the wheel speed). Fixes are the samples where
 * both gps_lat and gps_lon are finite.
 */
export function detectGpsFaults(dc: DetectorContext): Finding[] {
  const lat = dc.series.channels.gps_lat;
  const lon = dc.series.channels.gps_lon;
  if (!lat || !lon) return [];
  const t = dc.series.timeS;
  const wheel = dc.liveWheelMps;
  const gpsSpeed = dc.series.channels.gps_speed;
  const { th } = dc;
  const out: Finding[] = [];

  /** Mean wheel speed over samples a…b, NaN if none. */
  const wheelMean = (a: number, b: number) => {
    if (!wheel) return NaN;
    let s = 0;
    let k = 0;
    for (let i = a; i <= b; i++) {
      if (Number.isFinite(wheel[i])) {
        s += wheel[i];
        k++;
      }
    }
    return k ? s / k : NaN;
  };

  let prev = -1;
  let jumpStart = -1;
  let jumpEnd = -1;
  let jumpPeak = 0;
  let jumpLimit = 0;
  const flushJump = () => {
    if (jumpStart < 0) return;
    out.push(
      makeFinding(dc, jumpStart, jumpEnd, {
        kind: "gps_jump",
        severity: "info",
        measuredValue: jumpPeak,
        thresholdValue: jumpLimit,
        unit: "m/s",
        message: `GPS position jumped: ${kmh(jumpPeak)} implied between fixes${onLap(dc, jumpStart)}. Distances and gates there are unreliable.`,
      }),
    );
    jumpStart = -1;
  };

  for (let i = 0; i < t.length; i++) {
    if (!validFix(lat[i], lon[i])) continue;
    if (prev < 0) {
      prev = i;
      continue;
    }
    const gapS = t[i] - t[prev];
    const ref = wheel ? wheelMean(prev, i) : Math.max(gpsSpeed?.[prev] ?? NaN, gpsSpeed?.[i] ?? NaN);
    if (gapS > th.gpsDropoutS) {
      flushJump();
      // Moving: by wheel speed if there is one, else by the GPS speed at the fixes either side.
      if (ref > th.gpsMovingSpeedMps) {
        out.push(
          makeFinding(dc, prev, i, {
            kind: "gps_dropout",
            severity: "info",
            measuredValue: gapS,
            thresholdValue: th.gpsDropoutS,
            unit: "s",
            message: `No GPS fix for ${gapS.toFixed(1)} s while moving${onLap(dc, prev)}.`,
          }),
        );
      }
    } else if (gapS > 0) {
      const stepM = haversineM(lat[prev], lon[prev], lat[i], lon[i]);
      const implied = stepM / gapS;
      const overAbs = implied > th.gpsJumpMaxSpeedMps;
      const overWheel = Number.isFinite(ref) && implied > th.gpsJumpWheelFactor * ref && stepM - ref * gapS > th.gpsJumpMinExcessM;
      if (overAbs || overWheel) {
        const limit = overAbs ? th.gpsJumpMaxSpeedMps : th.gpsJumpWheelFactor * ref;
        if (jumpStart < 0) {
          jumpStart = prev;
          jumpPeak = implied;
          jumpLimit = limit;
        } else if (implied > jumpPeak) {
          jumpPeak = implied;
          jumpLimit = limit;
        }
        jumpEnd = i;
      } else flushJump();
    }
    prev = i;
  }
  flushJump();
  return out;
}

/** The channel roles this detector reads (besides the ground speed every detector gets: DETECTOR_CONTEXT_READS). */
detectGpsFaults.reads = ["gps_lat", "gps_lon", "gps_speed"] as const;
