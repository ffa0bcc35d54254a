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

/** A channel stuck on one value while the bike moves faster than the set speed for longer than the set time. */
export function detectSensorFlat(dc: DetectorContext): Finding[] {
  const v = dc.groundSpeedMs;
  if (!v) return [];
  const t = dc.series.timeS;
  const n = t.length;
  const out: Finding[] = [];
  for (const [role, tol] of WATCHED) {
    const x = dc.series.channels[role];
    if (!x) continue;
    const minS = role === "throttle" ? dc.th.throttleFlatMinDurationS : dc.th.sensorFlatMinDurationS;
    let start = -1;
    let lo = 0;
    let hi = 0;
    const close = (end: number) => {
      if (start >= 0 && t[end] - t[start] >= minS) {
        out.push(
          makeFinding(dc, start, end, {
            kind: "sensor_flat",
            severity: "warning",
            measuredValue: t[end] - t[start],
            thresholdValue: minS,
            unit: "s",
            channel: role,
            message: `${ROLE_LABEL[role]} held ${Number(lo.toPrecision(4))} for ${(t[end] - t[start]).toFixed(1)} s while moving${onLap(dc, start)}: sensor or wiring may be stuck.`,
          }),
        );
      }
      start = -1;
    };
    for (let i = 0; i < n; i++) {
      const xi = x[i];
      const moving = v[i] > dc.th.sensorFlatMinSpeedMs;
      if (!moving || !Number.isFinite(xi)) {
        close(i - 1 >= 0 ? i - 1 : 0);
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
        close(i - 1);
      }
      start = i;
      lo = hi = xi;
    }
    close(n - 1);
  }
  return out;
}
