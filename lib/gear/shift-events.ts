export interface ShiftOptions {
  /** A new gear must hold this long to count (s). Default 0.1 — filters ratio noise. */
  minHoldS?: number;
  /** Throttle held at or above this through an upshift means a clutchless shift (%). Default 50. */
  clutchlessMinThrottlePct?: number;
  /** The longest time between the two gears for one shift (s). Default 1. */
  maxShiftS?: number;
}

export interface ShiftEvent {
  /** Time of the first sample in the new gear (s). */
  timeS: number;
  index: number;
  fromGear: number;
  toGear: number;
  direction: "up" | "down";
  /** Upshift with the throttle held open and the rpm dropping (quickshifter / ignition cut). */
  clutchless: boolean;
  rpmBefore: number;
  rpmAfter: number;
  /** Time between the last sample in the old gear and the first in the new (s). */
  shiftTimeS: number;
}

/**
 * Gear changes from the gear channel (see gearFromRatios), skipping the 0s in between
 * (clutch in or ratio mismatch during the shift) and gears that do not hold `minHoldS`.
 */
export function shiftEvents(
  gear: ArrayLike<number>,
  rpm: ArrayLike<number>,
  throttlePct: ArrayLike<number> | undefined,
  timeS: Float64Array,
  opts: ShiftOptions = {},
): ShiftEvent[] {
  const minHoldS = opts.minHoldS ?? 0.1;
  const minThrottle = opts.clutchlessMinThrottlePct ?? 50;
  const maxShiftS = opts.maxShiftS ?? 1;
  const n = gear.length;

  // Stable stretches: [gear, first index, last index] holding at least minHoldS.
  const stretches: Array<[number, number, number]> = [];
  for (let i = 0; i < n; i++) {
    const g = gear[i]!;
    let j = i;
    while (j + 1 < n && gear[j + 1] === g) j++;
    if (g > 0 && timeS[j]! - timeS[i]! >= minHoldS - 1e-9) {
      const last = stretches[stretches.length - 1];
      if (last && last[0] === g) last[2] = j;
      else stretches.push([g, i, j]);
    }
    i = j;
  }

  const events: ShiftEvent[] = [];
  for (let k = 1; k < stretches.length; k++) {
    const [g0, , end0] = stretches[k - 1]!;
    const [g1, start1] = stretches[k]!;
    const shiftTimeS = timeS[start1]! - timeS[end0]!;
    if (shiftTimeS > maxShiftS) continue;
    const up = g1 > g0;
    let throttleHeld = throttlePct !== undefined;
    if (throttlePct) for (let i = end0; i <= start1; i++) if (!(throttlePct[i]! >= minThrottle)) throttleHeld = false;
    const rpmBefore = rpm[end0]!;
    const rpmAfter = rpm[start1]!;
    events.push({
      timeS: timeS[start1]!,
      index: start1,
      fromGear: g0,
      toGear: g1,
      direction: up ? "up" : "down",
      clutchless: up && throttleHeld && rpmAfter < rpmBefore,
      rpmBefore,
      rpmAfter,
      shiftTimeS,
    });
  }
  return events;
}
