import { DEFAULT_THRESHOLDS, type ThresholdKey } from "./thresholds";

/**
 * Which thresholds are set per bike and which per track, and how each is shown and entered:
 * SI inside, the trade's everyday unit on screen (bar, km/h, mm, %). `factor` converts SI → shown.
 */
export interface ThresholdField {
  key: ThresholdKey;
  label: string;
  unit: string;
  factor: number;
  min: number;
  max: number;
}

const f = (key: ThresholdKey, label: string, unit: string, factor: number, min: number, max: number): ThresholdField => ({ key, label, unit, factor, min, max });

/** Properties of the bike, its sensors and its electronics. */
export const BIKE_THRESHOLD_FIELDS: readonly ThresholdField[] = [
  f("brakeAppliedPa", "Brake on: front pressure above", "bar", 1e-5, 0.1, 50),
  f("brakeOnStraightPressurePa", "Brake on straight: front pressure (always found)", "bar", 1e-5, 0.1, 50),
  f("brakeOnStraightRestMarginPa", "Brake on straight: above the resting pressure by", "bar", 1e-5, 0.05, 20),
  f("brakeOnStraightThrottlePct", "Brake on straight: throttle above", "%", 1, 1, 100),
  f("brakeOnStraightMaxLeanDeg", "Brake on straight: lean below", "°", 1, 1, 60),
  f("brakeOnStraightMinSpeedMps", "Brake on straight: speed above", "km/h", 3.6, 10, 300),
  f("brakeOnStraightMinDurationS", "Brake on straight: lasting at least", "s", 1, 0.01, 10),
  f("wheelSpinTargetSlip", "Wheel spin: slip target", "%", 100, 1, 50),
  f("wheelSpinMinDurationS", "Wheel spin: lasting at least", "s", 1, 0.01, 10),
  f("wheelSpinMinThrottlePct", "Wheel spin: throttle at least", "%", 1, 0, 100),
  f("wheelieDecelMps2", "Wheel spin: front slowing faster than this is a wheelie", "m/s²", 1, 0.5, 20),
  f("bottomingMarginM", "Bottoming: within this of full stroke", "mm", 1000, 0, 30),
  f("bottomingDebounceS", "Bottoming: one event within", "s", 1, 0, 5),
  f("sensorFlatMinSpeedMps", "Sensor flat: judged above", "km/h", 3.6, 10, 300),
  f("sensorFlatMinDurationS", "Sensor flat: lasting at least", "s", 1, 1, 600),
  f("throttleFlatMinDurationS", "Throttle flat: lasting at least", "s", 1, 1, 600),
  f("clockGapFactor", "Clock gap: step longer than × usual", "×", 1, 1.5, 100),
];

/** Properties of the circuit and its GPS conditions. */
export const TRACK_THRESHOLD_FIELDS: readonly ThresholdField[] = [
  f("pitSpeedLimitMps", "Pit-lane speed limit", "km/h", 3.6, 20, 120),
  f("pitOverspeedMinDurationS", "Pit overspeed: lasting at least", "s", 1, 0.01, 10),
  f("gpsDropoutS", "GPS dropout: no fix for", "s", 1, 0.1, 60),
  f("gpsMovingSpeedMps", "GPS dropout: only above", "km/h", 3.6, 1, 100),
  f("gpsJumpMaxSpeedMps", "GPS jump: implied speed above", "km/h", 3.6, 100, 1000),
  f("gpsJumpWheelFactor", "GPS jump: × wheel speed", "×", 1, 1.1, 20),
  f("gpsJumpMinExcessM", "GPS jump: step beyond wheel travel", "m", 1, 0, 100),
];

export function shownDefault(field: ThresholdField): number {
  return round(DEFAULT_THRESHOLDS[field.key].value * field.factor);
}

export function round(x: number): number {
  return Number(x.toPrecision(6));
}
