/**
 * Effective rolling radius of a motorcycle tyre at a lean angle, by a simple geometric model:
 * the tyre's crown cross-section is taken as a circle of radius `crownRadiusM`; leaning by φ
 * moves the contact point round that circle toward the crown's edge, so the distance from the
 * wheel axis to the ground drops by rc·(1 − cos φ):
 *
 *   r_eff = r0 − rc·(1 − cos φ)
 *
 * It ignores carcass deflection and the change of load with lean; it is a first-order model,
 * good enough to stop lean alone from showing as slip. The crown radius is a bike setting.
 */
export function effectiveRollingRadiusM(uprightRadiusM: number, crownRadiusM: number, leanDeg: number): number {
  const phi = (leanDeg * Math.PI) / 180;
  return uprightRadiusM - crownRadiusM * (1 - Math.cos(phi));
}
