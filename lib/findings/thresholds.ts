export interface ThresholdDefault {
  value: number;
  unit: string;
  /** One line: why this value. */
  rationale: string;
  /** "common practice", "Lapbench default" (our own setting) or a named reference. */
  source: string;
}

/**
 * No rev ceiling is assumed: an engine's ceiling depends on its class and build (a 1000 cc
 * four-cylinder superbike around 14,000–14,300 rpm, common practice; a twin or a smaller engine far
 * lower). A bike without its own ceiling gets no rev-ceiling finding, and the session says so.
 */
export const NO_REV_CEILING_NOTE = "No rev ceiling is set for this bike, so engine speed was not checked against one. Set it on the bike.";

/**
 * Default thresholds of the findings engine, each with its reason and where it comes from.
 * Every one is a setting per bike and track; the Settings screen shows these as the defaults.
 * Values are SI (Pa, m/s, m, s); the rationale gives the everyday unit.
 */
export const DEFAULT_THRESHOLDS = {
  brakeAppliedPa: {
    value: 2e5,
    unit: "Pa",
    rationale: "Front pressure above 2 bar counts as the brake on: where braking points and the rider brief say braking starts.",
    source: "Lapbench default",
  },
  brakeOnStraightPressurePa: {
    value: 2e5,
    unit: "Pa",
    rationale: "2 bar front pressure with the throttle open is always found, whatever the sensor's resting level; a lever pushed by air at speed can reach it.",
    source: "Lapbench default",
  },
  brakeOnStraightRestMarginPa: {
    value: 0.5e5,
    unit: "Pa",
    rationale: "Also found: 0.5 bar (or 5 × its spread, whichever is more) above the pressure the sensor rests at with the throttle wide open in this session.",
    source: "Lapbench default",
  },
  brakeOnStraightThrottlePct: {
    value: 50,
    unit: "%",
    rationale: "Above half throttle the rider is driving, not braking; pressure then is not meant.",
    source: "Lapbench default",
  },
  brakeOnStraightMaxLeanDeg: {
    value: 10,
    unit: "deg",
    rationale: "A straight is ridden upright; trail braking into a corner at lean is meant.",
    source: "Lapbench default",
  },
  brakeOnStraightMinSpeedMps: {
    value: 100 / 3.6,
    unit: "m/s",
    rationale: "100 km/h: slower than that the bike is in a slow corner or the pit lane, not on a straight.",
    source: "Lapbench default",
  },
  brakeOnStraightMinDurationS: {
    value: 0.1,
    unit: "s",
    rationale: "Ignores a single-sample spike from a noisy pressure sensor.",
    source: "Lapbench default",
  },
  pitSpeedLimitMps: {
    value: 40 / 3.6,
    unit: "m/s",
    rationale: "40 km/h, the lower and safer of the usual figures (40 km/h in some national series, 60 km/h in others) — set the track's own.",
    source: "common practice",
  },
  pitOverspeedMinDurationS: {
    value: 0.1,
    unit: "s",
    rationale: "Ignores a single-sample spike of the wheel-speed signal.",
    source: "Lapbench default",
  },
  wheelSpinTargetSlip: {
    value: 0.08,
    unit: "",
    rationale: "8 % rear slip as a starting target; the right figure depends on tyre, bike and traction-control map.",
    source: "Lapbench default",
  },
  wheelSpinMinDurationS: {
    value: 0.3,
    unit: "s",
    rationale: "Short slip peaks are normal on a drive; only sustained spin is worth a look.",
    source: "Lapbench default",
  },
  wheelieDecelMps2: {
    value: 5,
    unit: "m/s²",
    rationale: "A front wheel slowing faster than 5 m/s² with the throttle open is in the air (a wheelie), not braking: slip measured against it is not spin.",
    source: "Lapbench default",
  },
  wheelSpinMinThrottlePct: {
    value: 20,
    unit: "%",
    rationale: "Spin counts under open throttle only.",
    source: "Lapbench default",
  },
  bottomingMarginM: {
    value: 0.003,
    unit: "m",
    rationale: "3 mm short of full stroke counts as bottoming: pots rarely read the last millimetres exactly.",
    source: "Lapbench default",
  },
  bottomingDebounceS: {
    value: 0.2,
    unit: "s",
    rationale: "One hit that rings twice within 0.2 s is one event.",
    source: "Lapbench default",
  },
  sensorFlatMinSpeedMps: {
    value: 20,
    unit: "m/s",
    rationale: "Judged above 72 km/h only, faster than any pit lane, so riding the pit limiter at a steady throttle does not count.",
    source: "Lapbench default",
  },
  sensorFlatMinDurationS: {
    value: 20,
    unit: "s",
    rationale: "Longer than a straight, where lean can read an exact 0; a failed sensor usually stays stuck far longer.",
    source: "Lapbench default",
  },
  throttleFlatMinDurationS: {
    value: 30,
    unit: "s",
    rationale: "Throttle is legitimately held wide open through sweepers and a long straight; 30 s is longer than that.",
    source: "Lapbench default",
  },
  gpsDropoutS: {
    value: 1,
    unit: "s",
    rationale: "More than 1 s between fixes while moving is 10–25 missed fixes at usual logger rates.",
    source: "Lapbench default",
  },
  gpsMovingSpeedMps: {
    value: 5,
    unit: "m/s",
    rationale: "A dropout only matters while the bike moves.",
    source: "Lapbench default",
  },
  gpsJumpMaxSpeedMps: {
    value: 100,
    unit: "m/s",
    rationale: "360 km/h is above the top speed of the bikes Lapbench is built for; faster than that between two fixes, the fix jumped.",
    source: "Lapbench default",
  },
  gpsJumpWheelFactor: {
    value: 3,
    unit: "",
    rationale: "A fix-to-fix speed over 3× the wheel speed is a jump, not the bike.",
    source: "Lapbench default",
  },
  gpsJumpMinExcessM: {
    value: 5,
    unit: "m",
    rationale: "At a standstill any fix scatter beats 3× wheel speed; the step must also exceed the wheel's travel by 5 m.",
    source: "Lapbench default",
  },
  clockGapFactor: {
    value: 3,
    unit: "",
    rationale: "A step over 3× the median sample interval means samples are missing.",
    source: "Lapbench default",
  },
} as const satisfies Record<string, ThresholdDefault>;

export type ThresholdKey = keyof typeof DEFAULT_THRESHOLDS;
export type Thresholds = Record<ThresholdKey, number>;
