/**
 * Mechanical horsepower from torque in pound-force feet and engine speed:
 * hp = lbf·ft · rpm / 5252.113 (5252.113 = 33 000 / 2π; 1 hp = 550 ft·lbf/s). At 5252 rpm the
 * torque in lbf·ft and the power in hp are the same number.
 */
export function powerHpFromLbfFt(torqueLbfFt: number, rpm: number): number {
  return (torqueLbfFt * rpm * 2 * Math.PI) / 33000;
}

/** Watts per mechanical horsepower (NIST SP 811, App. B: 1 hp = 745.69987 W). */
export const WATTS_PER_HP = 745.69987;

/** Newton metres per pound-force foot (NIST SP 811, App. B: 1 lbf·ft = 1.355818 N·m). */
export const NM_PER_LBF_FT = 1.3558179483314004;

/** Kilowatts to mechanical horsepower. */
export function kwToHp(kw: number): number {
  return (kw * 1000) / WATTS_PER_HP;
}
