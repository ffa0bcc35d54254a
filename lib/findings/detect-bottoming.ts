import { bottomingEvents } from "@/lib/suspension/bottoming-events";
import { CAUTION_TEXT } from "./caution";
import type { DetectorContext } from "./detector-context";
import { makeFinding, onLap } from "./make-finding";
import type { Finding } from "./types";

/** Fork or shock travel reaching full stroke (needs the stroke from the bike). */
export function detectBottoming(dc: DetectorContext): Finding[] {
  const out: Finding[] = [];
  const parts = [
    { role: "fork_travel" as const, label: "Fork", strokeM: dc.ctx.bike?.forkStrokeM },
    { role: "shock_travel" as const, label: "Shock", strokeM: dc.ctx.bike?.shockStrokeM },
  ];
  for (const { role, label, strokeM } of parts) {
    const x = dc.series.channels[role];
    if (!x || strokeM === undefined) continue;
    for (const e of bottomingEvents(x, dc.series.timeS, strokeM, { marginM: dc.th.bottomingMarginM, debounceS: dc.th.bottomingDebounceS })) {
      out.push(
        makeFinding(dc, e.startIndex, e.endIndex, {
          kind: "bottoming",
          severity: "warning",
          measuredValue: e.peakTravelM,
          thresholdValue: strokeM - dc.th.bottomingMarginM,
          unit: "m",
          channel: role,
          message: `${label} travel reached ${(e.peakTravelM * 1000).toFixed(1)} mm of ${(strokeM * 1000).toFixed(0)} mm stroke${onLap(dc, e.startIndex)}.`,
          caution: CAUTION_TEXT,
        }),
      );
    }
  }
  return out;
}

/** The channel roles this detector reads (besides the ground speed every detector gets: DETECTOR_CONTEXT_READS). */
detectBottoming.reads = ["fork_travel", "shock_travel"] as const;
