export interface TimeInGear {
  gear: number;
  timeS: number;
  pct: number;
}

/**
 * Time spent in each gear (0 = neutral/clutch/unknown). Each sample holds until the next one;
 * steps longer than `maxStepS` (clock gaps) are not counted. Gears 0 … max gear seen, in order.
 */
export function timeInGear(gear: ArrayLike<number>, timeS: Float64Array, maxStepS = 1): TimeInGear[] {
  let maxGear = 0;
  for (let i = 0; i < gear.length; i++) if (gear[i]! > maxGear) maxGear = gear[i]!;
  const acc = new Float64Array(maxGear + 1);
  let total = 0;
  for (let i = 0; i + 1 < gear.length; i++) {
    const dt = timeS[i + 1]! - timeS[i]!;
    if (!(dt > 0 && dt <= maxStepS)) continue;
    acc[gear[i]!]! += dt;
    total += dt;
  }
  return Array.from(acc, (t, g) => ({ gear: g, timeS: t, pct: total > 0 ? (100 * t) / total : 0 }));
}
