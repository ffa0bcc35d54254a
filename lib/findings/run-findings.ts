import type { SeriesLike } from "@/lib/laps/types";
import { detectBottoming } from "./detect-bottoming";
import { detectBrakeOnStraight } from "./detect-brake-on-straight";
import { detectClockGaps } from "./detect-clock-gaps";
import { detectGpsFaults } from "./detect-gps-faults";
import { detectPitOverspeed } from "./detect-pit-overspeed";
import { detectRevCeiling } from "./detect-rev-ceiling";
import { detectSensorFlat } from "./detect-sensor-flat";
import { detectWheelSpin } from "./detect-wheel-spin";
import { buildDetectorContext, DETECTOR_CONTEXT_READS } from "./detector-context";
import type { ChannelRole } from "@/lib/channels/roles";
import type { Finding, FindingsContext } from "./types";

const DETECTORS = [
  detectBrakeOnStraight,
  detectRevCeiling,
  detectPitOverspeed,
  detectWheelSpin,
  detectBottoming,
  detectSensorFlat,
  detectGpsFaults,
  detectClockGaps,
];

/** Every role the findings read: each detector's own declaration and the shared context's. */
export const FINDINGS_READS: readonly ChannelRole[] = [...new Set<ChannelRole>([...DETECTOR_CONTEXT_READS, ...DETECTORS.flatMap((d) => d.reads)])];

/**
 * Everything that looks wrong in a session, one Finding per event (consecutive samples merged),
 * in time order. A detector whose channels or settings are missing finds nothing. Brake,
 * suspension and engine findings carry CAUTION_TEXT.
 */
export function runFindings(series: SeriesLike, ctx: FindingsContext = {}): Finding[] {
  const dc = buildDetectorContext(series, ctx);
  const all = DETECTORS.flatMap((detect) => detect(dc));
  return all.sort((a, b) => a.startTimeS - b.startTimeS || a.kind.localeCompare(b.kind));
}
