import type { DetectorContext } from "./detector-context";
import { makeFinding, onLap } from "./make-finding";
import type { Finding } from "./types";

/** Steps of the master clock longer than the set multiple of the median step: samples missing. */
export function detectClockGaps(dc: DetectorContext): Finding[] {
  const t = dc.series.timeS;
  if (!(dc.dtS > 0)) return [];
  const limit = dc.th.clockGapFactor * dc.dtS;
  const out: Finding[] = [];
  for (let i = 0; i + 1 < t.length; i++) {
    const step = t[i + 1] - t[i];
    if (step <= limit) continue;
    out.push(
      makeFinding(dc, i, i + 1, {
        kind: "clock_gap",
        severity: "info",
        measuredValue: step,
        thresholdValue: limit,
        unit: "s",
        message: `The log has a ${step.toFixed(3)} s gap between samples (usual step ${dc.dtS.toFixed(3)} s)${onLap(dc, i)}.`,
      }),
    );
  }
  return out;
}

/** The channel roles this detector reads (besides the ground speed every detector gets: DETECTOR_CONTEXT_READS). */
detectClockGaps.reads = [] as const;
