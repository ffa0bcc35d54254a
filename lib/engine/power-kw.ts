/** Power from torque and engine speed, P = T·ω with ω = 2π·rpm/60: kW = N·m · rpm / 9549.297. */
export function powerKw(torqueNm: number, rpm: number): number {
  return (torqueNm * rpm * 2 * Math.PI) / 60 / 1000;
}
