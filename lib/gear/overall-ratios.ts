export interface Drivetrain {
  primaryRatio: number;
  /** Gearbox ratios, first gear first. */
  gearboxRatios: readonly number[];
  sprocketFront: number;
  sprocketRear: number;
  /** Rolling circumference of the rear tyre (m). */
  rearCircumferenceM: number;
}

/**
 * Engine revolutions per rear-wheel revolution in each gear:
 * primary × gearbox × (rear sprocket / front sprocket). Index 0 is first gear.
 */
export function overallRatios(bike: Drivetrain): Float64Array {
  const chain = bike.sprocketRear / bike.sprocketFront;
  return Float64Array.from(bike.gearboxRatios, (g) => bike.primaryRatio * g * chain);
}
