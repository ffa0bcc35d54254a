import { driveSlip } from "@/lib/slip/drive-slip";
import { spinEvents } from "@/lib/slip/spin-events";
import type { DetectorContext } from "./detector-context";
import { makeFinding, onLap } from "./make-finding";
import type { Finding } from "./types";

/** Rear-wheel slip beyond the target, under open throttle, for longer than the set time. */
export function detectWheelSpin(dc: DetectorContext): Finding[] {
  const c = dc.series.channels;
  if (!c.speed_front || !c.speed_rear) return [];
  const { th } = dc;
  const slip = driveSlip(dc.series, dc.ctx.bike?.slip);
  const events = spinEvents(slip, c.throttle, dc.series.timeS, {
    targetSlip: th.wheelSpinTargetSlip,
    minThrottlePct: th.wheelSpinMinThrottlePct,
    minDurationS: th.wheelSpinMinDurationS,
    frontSpeedMps: c.speed_front,
    wheelieDecelMps2: th.wheelieDecelMps2,
  });
  return events.map((e) =>
    makeFinding(dc, e.startIndex, e.endIndex, {
      kind: "wheel_spin",
      severity: "info",
      measuredValue: e.peakSlip,
      thresholdValue: th.wheelSpinTargetSlip,
      unit: "",
      message:
        `Rear wheel slip up to ${(e.peakSlip * 100).toFixed(0)} % for ${e.durationS.toFixed(2)} s, ` +
        `beyond the ${(th.wheelSpinTargetSlip * 100).toFixed(0)} % target${onLap(dc, e.startIndex)}.`,
    }),
  );
}

/** The channel roles this detector reads (besides the ground speed every detector gets: DETECTOR_CONTEXT_READS). */
detectWheelSpin.reads = ["speed_front", "speed_rear", "throttle"] as const;
