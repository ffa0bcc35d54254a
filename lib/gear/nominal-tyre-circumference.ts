/**
 * Nominal outside circumference of a tyre from its size marking (e.g. 190/55 ZR17):
 * D = 25.4·rim + 2·width·aspect/100 (ISO 5751 / ETRTO sizing practice), C = π·D, in metres.
 * The real rolling circumference under load is smaller; teams enter the measured one.
 */
export function nominalTyreCircumferenceM(widthMm: number, aspectPct: number, rimIn: number): number {
  const diameterMm = 25.4 * rimIn + (2 * widthMm * aspectPct) / 100;
  return (Math.PI * diameterMm) / 1000;
}
