import { CAUTION_TEXT } from "./caution";
import type { DetectorContext } from "./detector-context";
import { makeFinding, onLap } from "./make-finding";
import { maskRuns } from "./mask-runs";
import type { Finding } from "./types";

/**
 * Engine speed above the bike's rev ceiling. No ceiling is assumed for a bike without one
 * (NO_REV_CEILING_NOTE): a default would give a smaller engine false critical findings and leave
 * a twin unchecked.
 */
export function detectRevCeiling(dc: DetectorContext): Finding[] {
  const rpm = dc.series.channels.engine_rpm;
  const ceiling = dc.ctx.bike?.revCeilingRpm;
  if (!rpm || ceiling === undefined || !Number.isFinite(ceiling)) return [];
  const runs = maskRuns(rpm.length, (i) => rpm[i] > ceiling, dc.series.timeS, { mergeGapS: 0.2, dtS: dc.dtS });
  return runs.map(({ start, end }) => {
    let peak = -Infinity;
    for (let i = start; i <= end; i++) if (rpm[i] > peak) peak = rpm[i];
    return makeFinding(dc, start, end, {
      kind: "rev_ceiling",
      severity: "critical",
      measuredValue: peak,
      thresholdValue: ceiling,
      unit: "rpm",
      message: `Engine speed reached ${Math.round(peak)} rpm, above the ${Math.round(ceiling)} rpm ceiling${onLap(dc, start)}.`,
      caution: CAUTION_TEXT,
    });
  });
}

/** The channel roles this detector reads (besides the ground speed every detector gets: DETECTOR_CONTEXT_READS). */
detectRevCeiling.reads = ["engine_rpm"] as const;
