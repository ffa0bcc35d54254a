import { ROLE_LABEL, type ChannelRole } from "@/lib/channels/roles";
import type { DetectorContext } from "./detector-context";
import { makeFinding, onLap } from "./make-finding";
import type { Finding } from "./types";

/**
 * Channels a working sensor keeps changing while the bike moves, with the smallest change that
 * counts as "moved" (about one step of a typical logger's resolution, SI units). Brake pressure
 * is left out: it rightly reads zero for whole straights.
 */
const WATCHED: ReadonlyArray<[Exclude<ChannelRole, "time" | "other">, number]> = [
  ["speed_front", 0.01],
  ["speed_rear", 0.01],
  ["engine_rpm", 1],
  ["throttle", 0.05],
  ["fork_travel", 1e-5],
  ["shock_travel", 1e-5],
  ["lean_angle", 0.01],
  ["accel_long", 0.001],
  ["accel_lat", 0.001],
];

/** The finding for a flat stretch start…end of `role` (held at `lo`), or null when it was too short. */
function flatFinding(dc: DetectorContext, role: Exclude<ChannelRole, "time" | "other">, start: number, end: number, lo: number, minS: number): Finding | null {
  const t = dc.series.timeS;
  if (!(t[end] - t[start] >= minS)) return null;
  return makeFinding(dc, start, end, {
    kind: "sensor_flat",
    severity: "warning",
    measuredValue: t[end] - t[start],
    thresholdValue: minS,
    unit: "s",
    channel: role,
    message: `${ROLE_LABEL[role]} held ${Number(lo.toPrecision(4))} for ${(t[end] - t[start]).toFixed(1)} s while moving${onLap(dc, start)}: sensor or wiring may be stuck.`,
  });
}

/** A channel stuck on one value while the bike moves faster than the set speed for longer than the set time. */
export function detectSensorFlat(dc: DetectorContext): Finding[] {
  const v = dc.groundSpeedMps;
  if (!v) return [];
  const t = dc.series.timeS;
  const n = t.length;
  const minSpeedMps = dc.th.sensorFlatMinSpeedMps;
  const out: Finding[] = [];
  // A dead wheel sensor is one finding for the session, not a flat stretch per lap.
  for (const d of dc.deadWheels) {
    const w = dc.series.channels[d.role]!;
    let first = 0;
    while (first < n - 1 && !(v[first] > 10)) first++;
    out.push(
      makeFinding(dc, first, n - 1, {
        kind: "sensor_flat",
        severity: "warning",
        measuredValue: d.deadShare * d.movingS,
        thresholdValue: 0,
        unit: "s",
        channel: d.role,
        message:
          `${ROLE_LABEL[d.role]} reads ${Number.isFinite(w[first]) ? Number((w[first] * 3.6).toFixed(1)) : "nothing"} km/h for ${Math.round(d.deadShare * 100)} % of the ${d.movingS.toFixed(0)} s the ${d.referenceName} says the bike moved (up to ${(d.referenceMaxMps * 3.6).toFixed(0)} km/h): ` +
          `the sensor or its wiring is likely dead. Distance and ground speed use the ${d.role === "speed_front" ? "GPS or the rear wheel" : "front wheel or GPS"} instead.`,
      }),
    );
  }
  for (const [role, tol] of WATCHED) {
    const x = dc.series.channels[role];
    if (!x || dc.deadWheels.some((d) => d.role === role)) continue;
    const minS = role === "throttle" ? dc.th.throttleFlatMinDurationS : dc.th.sensorFlatMinDurationS;
    // The run's state lives in plain locals, not in a closure: captured variables are kept in a
    // heap context (a boxed number per write), which made this the slowest detector by far.
    let start = -1;
    let lo = 0;
    let hi = 0;
    for (let i = 0; i < n; i++) {
      const xi = x[i];
      if (!(v[i] > minSpeedMps) || !Number.isFinite(xi)) {
        if (start >= 0) {
          const f = flatFinding(dc, role, start, i - 1 >= 0 ? i - 1 : 0, lo, minS);
          if (f) out.push(f);
          start = -1;
        }
        continue;
      }
      if (start >= 0) {
        const nlo = Math.min(lo, xi);
        const nhi = Math.max(hi, xi);
        if (nhi - nlo <= tol) {
          lo = nlo;
          hi = nhi;
          continue;
        }
        const f = flatFinding(dc, role, start, i - 1, lo, minS);
        if (f) out.push(f);
      }
      start = i;
      lo = hi = xi;
    }
    if (start >= 0) {
      const f = flatFinding(dc, role, start, n - 1, lo, minS);
      if (f) out.push(f);
    }
  }
  return out;
}

/** The channel roles this detector reads (besides the ground speed every detector gets: DETECTOR_CONTEXT_READS). */
detectSensorFlat.reads = ["speed_front", "speed_rear", "engine_rpm", "fork_travel", "shock_travel", "lean_angle", "accel_long", "accel_lat"] as const;
