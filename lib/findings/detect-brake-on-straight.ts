import { CAUTION_TEXT } from "./caution";
import type { DetectorContext } from "./detector-context";
import { bar, makeFinding, onLap } from "./make-finding";
import { maskRuns } from "./mask-runs";
import type { Finding } from "./types";

/** Front brake pressure above the threshold while the throttle is open. */
export function detectBrakeOnStraight(dc: DetectorContext): Finding[] {
  const p = dc.series.channels.brake_front;
  const thr = dc.series.channels.throttle;
  if (!p || !thr) return [];
  const { th } = dc;
  const runs = maskRuns(p.length, (i) => p[i] > th.brakeOnStraightPressurePa && thr[i] > th.brakeOnStraightThrottlePct, dc.series.timeS, {
    minDurationS: th.brakeOnStraightMinDurationS,
    mergeGapS: dc.dtS * 1.5,
    dtS: dc.dtS,
  });
  return runs.map(({ start, end }) => {
    let peak = -Infinity;
    for (let i = start; i <= end; i++) if (p[i] > peak) peak = p[i];
    return makeFinding(dc, start, end, {
      kind: "brake_on_straight",
      severity: "warning",
      measuredValue: peak,
      thresholdValue: th.brakeOnStraightPressurePa,
      unit: "Pa",
      message:
        `Front brake pressure up to ${bar(peak)} with the throttle above ${th.brakeOnStraightThrottlePct} %${onLap(dc, start)}. ` +
        "A lever pushed by air at speed can do this; so can a dragging brake.",
      caution: CAUTION_TEXT,
    });
  });
}
