/**
 * Longitudinal slip ratio of the rear wheel with the front wheel as the ground reference:
 *
 *   slip = (v_rear − v_front) / v_front
 *
 * This is the SAE J670 / ISO 8855 definition (Ω·r_e − V_x) / V_x with the free-rolling front
 * wheel standing in for the vehicle's ground speed V_x: positive when driving, negative when the
 * rear brakes, −1 for a locked rear wheel. (Some traction literature divides by the wheel speed
 * instead; we do not.) Returns NaN when the front speed is not positive.
 */
export function slipRatio(vRearMps: number, vFrontMps: number): number {
  if (!(vFrontMps > 0)) return NaN;
  return (vRearMps - vFrontMps) / vFrontMps;
}
